import type { InputHTMLAttributes } from "react";

/** A labelled input with its error in place (aria-invalid + aria-describedby), Quell's form look. */
export function Field({
  label,
  name,
  errors,
  hint,
  ...input
}: { label: string; name: string; errors?: string[]; hint?: string } & InputHTMLAttributes<HTMLInputElement>) {
  const id = `f-${name}`;
  const errId = errors?.length ? `${id}-err` : undefined;
  const hintId = hint ? `${id}-hint` : undefined;
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-sm font-medium text-ink">
        {label}
      </label>
      <input
        id={id}
        name={name}
        aria-invalid={errors?.length ? true : undefined}
        aria-describedby={[errId, hintId].filter(Boolean).join(" ") || undefined}
        className="rounded border border-hairline bg-white px-3 py-2 text-sm text-ink outline-none focus:border-signal focus:ring-2 focus:ring-signal-light aria-[invalid=true]:border-verdict-fail"
        {...input}
      />
      {hint && (
        <p id={hintId} className="text-xs text-ink-muted">
          {hint}
        </p>
      )}
      {errors?.length ? (
        <p id={errId} className="text-xs text-verdict-fail">
          {errors.join(" ")}
        </p>
      ) : null}
    </div>
  );
}

/** The form-level message: refusals in the fail colour with a word, confirmations in teal. */
export function FormMessage({ message, ok }: { message?: string; ok?: boolean }) {
  if (!message) return null;
  return (
    <p role={ok ? "status" : "alert"} className={`rounded border px-3 py-2 text-sm ${ok ? "border-signal-light bg-signal-light/40 text-ink" : "border-verdict-fail/30 bg-red-50 text-verdict-fail"}`}>
      {ok ? "" : "Not done: "}
      {message}
    </p>
  );
}

export function SubmitButton({ pending, children }: { pending: boolean; children: React.ReactNode }) {
  return (
    <button
      type="submit"
      disabled={pending}
      className="rounded bg-signal px-4 py-2 text-sm font-medium text-white hover:bg-signal-dark disabled:opacity-60"
    >
      {pending ? "Working…" : children}
    </button>
  );
}
