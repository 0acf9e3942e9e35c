/** Status words of scenarios and library entries, shared by the server and the UI (no imports here). */

/** Where a scenario stands in its team's own process (no rules attached: a label the team sets). */
export const SCENARIO_STATUSES = ["draft", "review", "final"] as const;
export type ScenarioStatus = (typeof SCENARIO_STATUSES)[number];

/** Where a library entry stands in the validation workflow (lib/library/workflow.ts moves it). */
export const LIBRARY_STATUSES = ["draft", "submitted", "validated", "retired"] as const;
export type LibraryStatus = (typeof LIBRARY_STATUSES)[number];
