import { afterAll, describe, expect, it } from "vitest";
import { formatDayTime } from "@/lib/day-time";

// The reference is the platform's own formatter (ICU's en-GB data): formatDayTime must print exactly
// what `Intl.DateTimeFormat("en-GB", …)` prints, so replacing it changes nothing on screen.
const OPTIONS: Intl.DateTimeFormatOptions = { day: "numeric", month: "short", year: "numeric", hour: "2-digit", minute: "2-digit" };

/** Every month, both ends of the day, leap day, far past and future, and the hours around DST changes in 2026. */
function moments(): Date[] {
  const out: Date[] = [];
  for (let m = 0; m < 12; m++) for (const [d, h, min] of [[1, 0, 0], [9, 9, 5], [28, 23, 59], [15, 12, 30]] as const) out.push(new Date(Date.UTC(2026, m, d, h, min)));
  out.push(new Date(Date.UTC(2028, 1, 29, 6, 7)), new Date(Date.UTC(1999, 11, 31, 23, 59)), new Date(Date.UTC(2070, 6, 4, 0, 1)));
  for (const day of [Date.UTC(2026, 2, 8), Date.UTC(2026, 2, 29), Date.UTC(2026, 9, 25), Date.UTC(2026, 10, 1)]) for (let q = 0; q < 48; q++) out.push(new Date(day + q * 30 * 60_000));
  return out;
}

describe("formatDayTime", () => {
  it("prints what Intl's en-GB formatter prints in UTC", () => {
    const intl = new Intl.DateTimeFormat("en-GB", { ...OPTIONS, timeZone: "UTC" });
    for (const d of moments()) expect(formatDayTime(d, { utc: true }), d.toISOString()).toBe(intl.format(d));
  });

  const tz = process.env.TZ;
  afterAll(() => {
    if (tz === undefined) delete process.env.TZ;
    else process.env.TZ = tz;
  });
  // Whole-hour, half-hour and 45-minute offsets, with and without daylight saving, both hemispheres.
  for (const zone of ["Europe/London", "America/St_Johns", "Asia/Kathmandu", "Australia/Adelaide", "Pacific/Auckland", "America/Los_Angeles"]) {
    it(`prints what Intl's en-GB formatter prints in the device's zone (${zone})`, () => {
      process.env.TZ = zone;
      const intl = new Intl.DateTimeFormat("en-GB", { ...OPTIONS, timeZone: zone });
      for (const d of moments()) expect(formatDayTime(d), d.toISOString()).toBe(intl.format(d));
    });
  }
});
