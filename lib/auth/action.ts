import "server-only";
import type { z, ZodType } from "zod";
import { currentUser } from "./current";
import { roleAtLeast, type CurrentUser, type Role } from "@/lib/shared/roles";
import type { ActionState } from "./action-state";
import { DomainError, fieldErrors } from "@/lib/errors";
import { DATABASE_UNAVAILABLE, isDatabaseUnavailable } from "@/lib/db/outage";

export type { ActionState };

function echo(formData: FormData): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [k, v] of formData) {
    if (typeof v === "string" && !/password|token/i.test(k) && !k.startsWith("$")) out[k] = v;
  }
  return out;
}

async function run(fn: () => Promise<ActionState | void>, formData: FormData): Promise<ActionState> {
  try {
    return (await fn()) ?? { ok: true };
  } catch (e) {
    // redirect()/notFound() throw too: only expected refusals become state, the rest propagates.
    if (e instanceof DomainError) return { message: e.message, values: echo(formData) };
    // An outage is not the form's fault: say so and keep what was typed, so sending again works once it is back.
    if (isDatabaseUnavailable(e)) return { message: DATABASE_UNAVAILABLE, values: echo(formData) };
    throw e;
  }
}

/**
 * One wrapper for every signed-in form action: checks the session and role on the server, safeParses the
 * FormData with zod, and returns `{ fieldErrors, message }` for useActionState instead of throwing.
 */
export function validatedAction<S extends ZodType>(
  schema: S,
  fn: (data: z.output<S>, user: CurrentUser, formData: FormData) => Promise<ActionState | void>,
  opts: { role?: Role } = {},
): (prev: ActionState, formData: FormData) => Promise<ActionState> {
  return async (_prev, formData) =>
    run(async () => {
      const user = await currentUser();
      if (!user) return { message: "Your session has ended: sign in again." };
      if (opts.role && !roleAtLeast(user.role, opts.role)) {
        return { message: `This needs the ${opts.role} role or higher.` };
      }
      const parsed = schema.safeParse(Object.fromEntries(formData));
      if (!parsed.success) {
        return { fieldErrors: actionFieldErrors(parsed.error), message: "Check the marked fields.", values: echo(formData) };
      }
      return fn(parsed.data, user, formData);
    }, formData);
}

/** The same for the few forms used before signing in (sign-in, sign-up, password reset). */
export function validatedPublicAction<S extends ZodType>(
  schema: S,
  fn: (data: z.output<S>, formData: FormData) => Promise<ActionState | void>,
): (prev: ActionState, formData: FormData) => Promise<ActionState> {
  return async (_prev, formData) => {
    const parsed = schema.safeParse(Object.fromEntries(formData));
    if (!parsed.success) {
      return { fieldErrors: actionFieldErrors(parsed.error), message: "Check the marked fields.", values: echo(formData) };
    }
    return run(() => fn(parsed.data, formData), formData);
  };
}

function actionFieldErrors(error: z.ZodError): Record<string, string[]> {
  return fieldErrors(error);
}

/** What an object-input server action answers when it refuses: the reason, for the page to show. */
export interface Refusal {
  ok: false;
  message: string;
  /** set when the database was unavailable: nothing happened, and the same request can be sent again */
  retry?: true;
}

/** An action's answer, or a refusal; one type when the answer already has a refusal branch (SaveResult). */
export type OrRefusal<R> = Refusal extends R ? R : R | Refusal;

/**
 * One wrapper for server actions called with an object (not a form): checks the session and role on the server,
 * safeParses the input with zod (the issues' messages joined), runs `fn`, and turns an expected refusal
 * (DomainError) into `{ ok: false, message }` instead of throwing. `messages` words the session and role refusals
 * for the action at hand.
 */
export function validatedInputAction<S extends ZodType, R>(
  schema: S,
  fn: (data: z.output<S>, user: CurrentUser) => Promise<R>,
  opts: { role?: Role; messages?: { session?: string; role?: string } } = {},
): (input: z.input<S>) => Promise<OrRefusal<R>> {
  const refuse = (message: string) => ({ ok: false, message }) as Refusal as OrRefusal<R>;
  const unavailable = () => ({ ok: false, message: DATABASE_UNAVAILABLE, retry: true }) as Refusal as OrRefusal<R>;
  return async (input) => {
    let user: CurrentUser | null;
    try {
      user = await currentUser();
    } catch (e) {
      if (isDatabaseUnavailable(e)) return unavailable();
      throw e;
    }
    if (!user) return refuse(opts.messages?.session ?? "Your session has ended: sign in again.");
    if (opts.role && !roleAtLeast(user.role, opts.role)) {
      return refuse(opts.messages?.role ?? `This needs the ${opts.role} role or higher.`);
    }
    const parsed = schema.safeParse(input);
    if (!parsed.success) return refuse(parsed.error.issues.map((i) => i.message).join("; "));
    try {
      return (await fn(parsed.data, user)) as OrRefusal<R>;
    } catch (e) {
      if (e instanceof DomainError) return refuse(e.message);
      // an outage: nothing was done, and the same request can be sent again once the database is back
      if (isDatabaseUnavailable(e)) return unavailable();
      throw e;
    }
  };
}
