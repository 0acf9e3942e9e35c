"use client";
import Link from "next/link";
import { useActionState } from "react";
import type { ActionState } from "@/lib/auth/action-state";
import { Field, FormMessage, SubmitButton } from "./Field";

type Action = (prev: ActionState, fd: FormData) => Promise<ActionState>;

export function SignInForm({ action, next }: { action: Action; next?: string }) {
  const [state, run, pending] = useActionState(action, {});
  return (
    <form action={run} className="flex flex-col gap-4" noValidate>
      <input type="hidden" name="next" value={next ?? ""} />
      <FormMessage message={state.message} ok={state.ok} />
      <Field label="E-mail" name="email" type="email" autoComplete="username" required defaultValue={state.values?.email} errors={state.fieldErrors?.email} />
      <Field label="Password" name="password" type="password" autoComplete="current-password" required errors={state.fieldErrors?.password} />
      <SubmitButton pending={pending}>Sign in</SubmitButton>
      <p className="text-sm text-ink-muted">
        <Link href="/forgot-password" className="text-signal underline">Forgot your password?</Link> ·{" "}
        <Link href="/sign-up" className="text-signal underline">Start a new team</Link>
      </p>
    </form>
  );
}

export function SignUpForm({ action }: { action: Action }) {
  const [state, run, pending] = useActionState(action, {});
  const v = state.values ?? {};
  return (
    <form action={run} className="flex flex-col gap-4" noValidate>
      <FormMessage message={state.message} ok={state.ok} />
      <Field label="Your name" name="name" autoComplete="name" required defaultValue={v.name} errors={state.fieldErrors?.name} />
      <Field label="E-mail" name="email" type="email" autoComplete="email" required defaultValue={v.email} errors={state.fieldErrors?.email} />
      <Field label="Password" name="password" type="password" autoComplete="new-password" required hint="At least 10 characters." errors={state.fieldErrors?.password} />
      <Field label="Team name" name="teamName" required defaultValue={v.teamName} hint="You will be the team's lead and can invite the others." errors={state.fieldErrors?.teamName} />
      <SubmitButton pending={pending}>Create account and team</SubmitButton>
      <p className="text-sm text-ink-muted">
        Have an account? <Link href="/sign-in" className="text-signal underline">Sign in</Link>
      </p>
    </form>
  );
}

export function ForgotPasswordForm({ action }: { action: Action }) {
  const [state, run, pending] = useActionState(action, {});
  return (
    <form action={run} className="flex flex-col gap-4" noValidate>
      <FormMessage message={state.message} ok={state.ok} />
      <Field label="E-mail" name="email" type="email" autoComplete="email" required defaultValue={state.values?.email} errors={state.fieldErrors?.email} />
      <SubmitButton pending={pending}>Send a reset link</SubmitButton>
    </form>
  );
}

export function ResetPasswordForm({ action, token }: { action: Action; token: string }) {
  const [state, run, pending] = useActionState(action, {});
  return (
    <form action={run} className="flex flex-col gap-4" noValidate>
      <input type="hidden" name="token" value={token} />
      <FormMessage message={state.message} ok={state.ok} />
      <Field label="New password" name="password" type="password" autoComplete="new-password" required hint="At least 10 characters." errors={state.fieldErrors?.password} />
      <Field label="New password again" name="confirm" type="password" autoComplete="new-password" required errors={state.fieldErrors?.confirm} />
      <SubmitButton pending={pending}>Set the new password</SubmitButton>
    </form>
  );
}

export function AcceptInvitationForm({ action, token, label }: { action: Action; token: string; label: string }) {
  const [state, run, pending] = useActionState(action, {});
  return (
    <form action={run} className="flex flex-col gap-4">
      <input type="hidden" name="token" value={token} />
      <FormMessage message={state.message} ok={state.ok} />
      <SubmitButton pending={pending}>{label}</SubmitButton>
    </form>
  );
}

export function NewAccountFromInvitationForm({ action, token, email }: { action: Action; token: string; email: string }) {
  const [state, run, pending] = useActionState(action, {});
  return (
    <form action={run} className="flex flex-col gap-4" noValidate>
      <input type="hidden" name="token" value={token} />
      <FormMessage message={state.message} ok={state.ok} />
      <p className="text-sm text-ink-muted">
        Account address: <span className="font-medium text-ink">{email}</span>
      </p>
      <Field label="Your name" name="name" autoComplete="name" required defaultValue={state.values?.name} errors={state.fieldErrors?.name} />
      <Field label="Password" name="password" type="password" autoComplete="new-password" required hint="At least 10 characters." errors={state.fieldErrors?.password} />
      <SubmitButton pending={pending}>Create account and join</SubmitButton>
    </form>
  );
}

export function CreateTeamForm({ action }: { action: Action }) {
  const [state, run, pending] = useActionState(action, {});
  return (
    <form action={run} className="flex flex-col gap-4" noValidate>
      <FormMessage message={state.message} ok={state.ok} />
      <Field label="Team name" name="teamName" required defaultValue={state.values?.teamName} errors={state.fieldErrors?.teamName} />
      <SubmitButton pending={pending}>Create the team</SubmitButton>
    </form>
  );
}

/** The narrow page frame of the account screens. */
export function AccountCard({ title, children }: { title: string; children: React.ReactNode }) {
  return (
    <main className="mx-auto max-w-md px-6 py-12">
      <h1 className="text-2xl font-semibold tracking-tight">{title}</h1>
      <div className="mt-6 rounded border border-hairline bg-white p-6">{children}</div>
    </main>
  );
}
