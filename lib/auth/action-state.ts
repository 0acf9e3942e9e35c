/** What every form's server action returns to useActionState (closed type: no index signature). */
export interface ActionState {
  ok?: boolean;
  message?: string;
  fieldErrors?: Record<string, string[]>;
  /** The submitted text fields (never passwords), so a refused form keeps what was typed. */
  values?: Record<string, string>;
}

export const initialActionState: ActionState = {};
