"use client";
import { useActionState, useRef } from "react";
import type { ActionState } from "@/lib/auth/action-state";

type Action = (prev: ActionState, fd: FormData) => Promise<ActionState>;

/**
 * The signed-in user's corner of the top bar: who and in which role, a team switcher when they belong to
 * several teams (a plain select and a button, so it works from the keyboard), sign-out, and sign-out on every
 * browser.
 */
export function UserMenu(props: {
  name: string;
  role: string;
  teamId: string;
  teams: { teamId: string; teamName: string; role: string }[];
  switchTeam: Action;
  signOut: () => Promise<void>;
  /** Ends every session of the user, on every browser. */
  signOutEverywhere: () => Promise<void>;
}) {
  const [state, run, pending] = useActionState(props.switchTeam, {});
  const form = useRef<HTMLFormElement>(null);
  return (
    <div className="flex flex-wrap items-center gap-3 md:ml-auto">
      {props.teams.length > 1 ? (
        <form ref={form} action={run} className="flex items-center gap-1">
          <label htmlFor="team-switch" className="sr-only">
            Team
          </label>
          <select
            id="team-switch"
            name="teamId"
            defaultValue={props.teamId}
            disabled={pending}
            onChange={() => form.current?.requestSubmit()}
            className="max-w-56 truncate rounded border border-hairline bg-white px-2 py-1 text-sm"
          >
            {props.teams.map((t) => (
              <option key={t.teamId} value={t.teamId}>
                {t.teamName} ({t.role})
              </option>
            ))}
          </select>
          <noscript>
            <button type="submit">Switch</button>
          </noscript>
          {state.message && (
            <span role="alert" className="text-xs text-verdict-fail">
              {state.message}
            </span>
          )}
        </form>
      ) : (
        <span className="max-w-56 truncate text-ink-muted">{props.teams[0]?.teamName}</span>
      )}
      <span className="text-ink" data-testid="who">
        {props.name} <span className="text-ink-muted">· {props.role}</span>
      </span>
      <form action={props.signOut}>
        <button type="submit" className="rounded border border-hairline px-2 py-1 text-ink-muted hover:text-ink">
          Sign out
        </button>
      </form>
      <form action={props.signOutEverywhere}>
        <button type="submit" className="text-xs text-ink-muted underline hover:text-ink" title="End your sessions on every browser and device">
          Sign out everywhere
        </button>
      </form>
    </div>
  );
}
