import "server-only";
import type { z, ZodType } from "zod";
import { currentUser } from "./current";
import { roleAtLeast, type CurrentUser, type Role } from "./roles";
import type { ActionState } from "./action-state";
import { fieldErrors } from "@/lib/api/handler";
import { DomainError } from "@/lib/db/errors";
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
