/**
 * A moment as people read it on screen, "24 Sept 2026, 09:40": day, short month, year, 24-hour time.
 * The same text as `Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", year: "numeric",
 * hour: "2-digit", minute: "2-digit" })`, built by hand: the browser's first date formatter loads its
 * locale and time-zone data in one go, a tenth of a second or more of a slow tablet's main thread
 * while the page is starting, for a dozen month names.
 */

const MONTHS = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sept", "Oct", "Nov", "Dec"] as const;

const two = (n: number) => (n < 10 ? `0${n}` : String(n));

/** "24 Sept 2026, 09:40" in the device's own time zone, or in UTC with `utc`. */
export function formatDayTime(date: Date, { utc = false }: { utc?: boolean } = {}): string {
  const day = utc ? date.getUTCDate() : date.getDate();
  const month = utc ? date.getUTCMonth() : date.getMonth();
  const year = utc ? date.getUTCFullYear() : date.getFullYear();
  const hours = utc ? date.getUTCHours() : date.getHours();
  const minutes = utc ? date.getUTCMinutes() : date.getMinutes();
  return `${day} ${MONTHS[month]} ${year}, ${two(hours)}:${two(minutes)}`;
}
