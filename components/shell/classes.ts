/**
 * Class names of the controls every page shares, so a button or a field looks the same wherever it is: the primary
 * action in signal teal, secondary actions on white with a hairline, the workbench's compact tool buttons, fields.
 */

/** The one primary action of a form or view. */
export const BUTTON_PRIMARY = "rounded bg-signal px-4 py-1.5 text-sm font-medium text-white hover:bg-signal-dark disabled:opacity-60";

/** A secondary action beside it. */
export const BUTTON = "rounded border border-hairline bg-white px-3 py-1.5 text-sm hover:border-signal";

/** The workbench's compact tool buttons (13 px). */
export const TOOL_BUTTON =
  "rounded border border-hairline bg-white px-2 py-1 text-[13px] hover:bg-paper focus-visible:outline-2 focus-visible:outline-signal disabled:opacity-40";

/** The primary action among the workbench's tool buttons (white on signal teal, 5.5:1). */
export const TOOL_BUTTON_PRIMARY =
  "rounded border border-signal bg-signal px-2 py-1 text-[13px] font-medium text-white hover:bg-signal-dark focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-signal disabled:opacity-60";

/** A text field or a select. */
export const FIELD = "rounded border border-hairline bg-white px-2 py-1 text-sm";
