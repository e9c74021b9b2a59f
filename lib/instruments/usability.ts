/**
 * May this instrument's readings go into submitted data on a given day? One rule for every screen and
 * route: an instrument past its calibration due date (or with no due date on record) needs a stated
 * reason; a retired one cannot be used for readings taken after it was retired.
 *
 * Dates are calendar dates (YYYY-MM-DD). An instrument is in calibration through its due date: "due
 * 2027-03-10" means it may be used on 10 March and is past due from 11 March (common practice: the
 * label gives the last day of validity).
 */

export interface UsabilityInput {
  serial: string;
  /** YYYY-MM-DD or null. */
  calibrationDueOn: string | null;
  /** Date, ISO string, or null. */
  retiredAt: Date | string | null;
}

export type UsabilityStatus = "ok" | "due-soon" | "overdue" | "no-due-date" | "retired";

export interface InstrumentUsability {
  status: UsabilityStatus;
  /** True when readings with it may be submitted without a stated reason. */
  ok: boolean;
  /** True when it may be used on submitted data only with a stated reason (overdue, or no due date on record). */
  reasonRequired: boolean;
  /** False only for a retired instrument: no reason makes it usable for readings after retirement. */
  usable: boolean;
  /** Days from the reading date to the due date: 12 = due in 12 days, −3 = three days past due, null without a due date. */
  daysUntilDue: number | null;
  /** A sentence for the screen: "Calibration due in 12 days", "Past due since 3 Oct 2026". */
  message: string;
}

/** Due within this many days counts as "due soon": a month's warning to book the laboratory (our choice). */
export const DUE_SOON_DAYS = 30;

/** A reason must say something: at least this many characters (our choice; "ok" is not a reason). */
export const MIN_REASON_LENGTH = 10;

const DAY_MS = 86_400_000;
const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

/** The calendar date of a moment in the runtime's time zone, or a YYYY-MM-DD string checked and returned as is. */
export function calendarDate(on: Date | string): string {
  if (typeof on === "string") {
    const m = ISO_DATE.exec(on);
    if (m) {
      if (!validDate(on)) throw new RangeError(`${on} is not a calendar date.`);
      return on;
    }
    on = new Date(on);
  }
  if (Number.isNaN(on.getTime())) throw new RangeError("The date is not valid.");
  const pad = (n: number) => String(n).padStart(2, "0");
  return `${on.getFullYear()}-${pad(on.getMonth() + 1)}-${pad(on.getDate())}`;
}

function validDate(iso: string): boolean {
  const m = ISO_DATE.exec(iso);
  if (!m) return false;
  const d = new Date(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])));
  return d.getUTCFullYear() === Number(m[1]) && d.getUTCMonth() === Number(m[2]) - 1 && d.getUTCDate() === Number(m[3]);
}

function dayNumber(iso: string): number {
  const m = ISO_DATE.exec(iso)!;
  return Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])) / DAY_MS;
}

/** Whole days from `from` to `to` (calendar dates). */
export function daysBetween(from: string, to: string): number {
  return dayNumber(to) - dayNumber(from);
}

const MONTHS = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];
/** "3 Oct 2026": unambiguous for readers on either side of the Atlantic. */
export function formatCalendarDate(iso: string): string {
  const m = ISO_DATE.exec(iso);
  if (!m) return iso;
  return `${Number(m[3])} ${MONTHS[Number(m[2]) - 1]} ${m[1]}`;
}

function lowerFirst(s: string): string {
  return s.charAt(0).toLowerCase() + s.slice(1);
}

function plural(n: number, word: string): string {
  return `${n} ${word}${n === 1 ? "" : "s"}`;
}

/**
 * Whether an instrument may be used for readings taken on `onDate` (a Date, taken in the runtime's
 * time zone, or the site's calendar date as YYYY-MM-DD).
 */
export function instrumentUsability(instrument: UsabilityInput, onDate: Date | string): InstrumentUsability {
  const day = calendarDate(onDate);
  if (instrument.retiredAt !== null) {
    const retiredDay = calendarDate(instrument.retiredAt);
    if (daysBetween(retiredDay, day) >= 0) {
      return {
        status: "retired",
        ok: false,
        reasonRequired: false,
        usable: false,
        daysUntilDue: instrument.calibrationDueOn ? daysBetween(day, instrument.calibrationDueOn) : null,
        message: `Retired on ${formatCalendarDate(retiredDay)}; choose another instrument`,
      };
    }
  }
  if (!instrument.calibrationDueOn) {
    return {
      status: "no-due-date",
      ok: false,
      reasonRequired: true,
      usable: true,
      daysUntilDue: null,
      message: "No calibration due date on record",
    };
  }
  const days = daysBetween(day, instrument.calibrationDueOn);
  if (days < 0) {
    const since = formatCalendarDate(calendarDateAfter(instrument.calibrationDueOn, 1));
    return {
      status: "overdue",
      ok: false,
      reasonRequired: true,
      usable: true,
      daysUntilDue: days,
      message: `Calibration past due since ${since} (${plural(-days, "day")})`,
    };
  }
  const message = days === 0 ? "Calibration due today" : `Calibration due in ${plural(days, "day")}`;
  return { status: days <= DUE_SOON_DAYS ? "due-soon" : "ok", ok: true, reasonRequired: false, usable: true, daysUntilDue: days, message };
}

function calendarDateAfter(iso: string, days: number): string {
  const d = new Date((dayNumber(iso) + days) * DAY_MS);
  return d.toISOString().slice(0, 10);
}

export interface InstrumentUse {
  /** The field that named the instrument, for the error: "instrumentId", "probeInstrumentId"… */
  field: string;
  instrument: UsabilityInput;
}

/**
 * The check to run when readings are submitted: every instrument used must be usable on the reading
 * date, and any that is past due (or has no due date) needs `reason` (at least MIN_REASON_LENGTH
 * characters). Returns field errors in the API's shape, or null when the submission may go ahead.
 * `reasonField` names the reason's field in the error ("overdueReason" by default).
 */
export function calibrationProblems(
  uses: readonly InstrumentUse[],
  onDate: Date | string,
  reason: string,
  reasonField = "overdueReason",
): Record<string, string> | null {
  const fields: Record<string, string> = {};
  const needingReason: string[] = [];
  for (const use of uses) {
    const u = instrumentUsability(use.instrument, onDate);
    if (!u.usable) fields[use.field] = `Instrument ${use.instrument.serial}: ${lowerFirst(u.message)}.`;
    else if (u.reasonRequired) needingReason.push(`${use.instrument.serial} (${lowerFirst(u.message)})`);
  }
  if (needingReason.length > 0 && reason.trim().length < MIN_REASON_LENGTH) {
    fields[reasonField] =
      `State why ${needingReason.join(" and ")} ${needingReason.length === 1 ? "was" : "were"} used on ${formatCalendarDate(calendarDate(onDate))}` +
      ` (at least ${MIN_REASON_LENGTH} characters); got ${reason.trim() === "" ? "nothing" : JSON.stringify(reason.trim())}.`;
  }
  return Object.keys(fields).length > 0 ? fields : null;
}
