import { describe, expect, it } from "vitest";
import { formatDate, formatDateTime, formatRelative } from "@/lib/shared/dates";

describe("dates, one format everywhere", () => {
  it("prints day, month name, year and 24-hour time in UTC whatever the machine's zone", () => {
    expect(formatDateTime("2026-12-02T04:18:00Z")).toBe("2 Dec 2026, 04:18 UTC");
    expect(formatDateTime("2026-12-16T23:59:00-05:00")).toBe("17 Dec 2026, 04:59 UTC");
    expect(formatDate("2026-12-02T04:18:00Z")).toBe("2 Dec 2026");
    expect(formatDateTime("not a date")).toBe("—");
  });
  it("says how long ago, up to a week; then the date", () => {
    const now = Date.parse("2026-12-02T12:00:00Z");
    expect(formatRelative("2026-12-02T11:59:30Z", now)).toBe("just now");
    expect(formatRelative("2026-12-02T11:55:00Z", now)).toBe("5 min ago");
    expect(formatRelative("2026-12-02T09:00:00Z", now)).toBe("3 h ago");
    expect(formatRelative("2026-11-30T12:00:00Z", now)).toBe("2 days ago");
    expect(formatRelative("2026-11-01T12:00:00Z", now)).toBe("1 Nov 2026");
  });
});
