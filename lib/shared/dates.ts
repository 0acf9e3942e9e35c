/**
 * Dates as Quell shows them, one format everywhere: "2 Dec 2026, 04:18 UTC" (day, month name, year, 24-hour time, the
 * time zone named), through Intl with an explicit time zone so the server and every browser print the same text;
 * and relative times ("3 h ago") where recency is what matters, with the full date beside them as a title.
 */

/** The one time zone dates are shown in. */
export const DISPLAY_TIME_ZONE = "UTC";

const dateTime = new Intl.DateTimeFormat("en-GB", {
  day: "numeric", month: "short", year: "numeric", hour: "2-digit", minute: "2-digit", hourCycle: "h23", timeZone: DISPLAY_TIME_ZONE,
});
const dateOnly = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", year: "numeric", timeZone: DISPLAY_TIME_ZONE });

type When = string | number | Date;
const toDate = (w: When) => (w instanceof Date ? w : new Date(w));

/** "2 Dec 2026, 04:18 UTC" */
export function formatDateTime(when: When): string {
  const d = toDate(when);
  if (Number.isNaN(d.getTime())) return "—";
  return `${dateTime.format(d).replace(" at ", ", ")} UTC`;
}

/** "2 Dec 2026" */
export function formatDate(when: When): string {
  const d = toDate(when);
  if (Number.isNaN(d.getTime())) return "—";
  return dateOnly.format(d);
}

/** "just now", "5 min ago", "3 h ago", "2 days ago"; older than a week: the date. `now` is injectable for tests. */
export function formatRelative(when: When, now: number = Date.now()): string {
  const d = toDate(when);
  if (Number.isNaN(d.getTime())) return "—";
  const s = Math.round((now - d.getTime()) / 1000);
  if (s < 0) return formatDateTime(d);
  if (s < 60) return "just now";
  if (s < 3600) return `${Math.floor(s / 60)} min ago`;
  if (s < 86400) return `${Math.floor(s / 3600)} h ago`;
  if (s < 7 * 86400) {
    const days = Math.floor(s / 86400);
    return `${days} day${days === 1 ? "" : "s"} ago`;
  }
  return formatDate(d);
}
