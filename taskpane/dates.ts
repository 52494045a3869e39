/**
 * Excel serial day numbers and dates, for date columns used as x in the preview: the data stay
 * serial numbers (what the worksheet functions see in Excel), and the chart axis and labels show
 * them as dates. Excel's 1900 date system: serial 1 is 1 January 1900, serial 61 is 1 March 1900,
 * and serial 60 stands for 29 February 1900, a day that did not exist (Excel keeps it for
 * compatibility with Lotus 1-2-3), so serials from 61 on count days from 30 December 1899. The time
 * of day is the fraction. Dates are taken as UTC wall-clock values, as exceljs reports them.
 * Pure functions, no host APIs.
 */

const MS_PER_DAY = 86400000;
/** Serial of 1970-01-01 (Unix epoch) in the 1900 date system. */
const UNIX_EPOCH_SERIAL = 25569;

/**
 * The Excel serial day number (1900 date system) of a date: days since 30 December 1899 plus the
 * time of day as a fraction; for dates before 1 March 1900 one less, as Excel counts them. O(1).
 * @param d a valid Date (its UTC fields are the wall-clock date and time).
 * @throws RangeError for an invalid Date or one before 1 January 1900.
 * @example serialOfDate(new Date(Date.UTC(2024, 2, 5, 12))) // → 45356.5
 */
export function serialOfDate(d: Date): number {
  const t = d.getTime();
  if (!Number.isFinite(t)) throw new RangeError('date: needs a valid date; got an invalid Date.');
  const s = t / MS_PER_DAY + UNIX_EPOCH_SERIAL;
  if (s >= 61) return s;
  if (s < 2) throw new RangeError(`date: needs a date from 1 January 1900 on; got ${d.toISOString().slice(0, 10)}.`);
  return s - 1;
}

/**
 * The date of an Excel serial day number (1900 date system), as a UTC Date. Serial 60 (from
 * 60 up to 61), the non-existent 29 February 1900, has no Date: it gives 1 March 1900 0:00;
 * {@link formatSerial} shows it as Excel does. O(1).
 * @param serial a finite number ≥ 1.
 * @throws RangeError for a serial below 1 or not finite.
 * @example dateOfSerial(45356.5).toISOString() // → '2024-03-05T12:00:00.000Z'
 */
export function dateOfSerial(serial: number): Date {
  if (!Number.isFinite(serial) || serial < 1) throw new RangeError(`serial: needs a day number ≥ 1; got ${serial}.`);
  const s = serial >= 61 ? serial : serial < 60 ? serial + 1 : 61;
  return new Date(Math.round((s - UNIX_EPOCH_SERIAL) * MS_PER_DAY));
}

const pad = (n: number) => String(n).padStart(2, '0');

/**
 * A serial day number as an ISO-style date, "2024-03-05", with the time of day when the serial
 * has a fraction ("2024-03-05 14:30", seconds only when not zero, rounded to the second);
 * serial 60 is shown as "1900-02-29", as Excel shows it. Serials below 1 or not finite (outside
 * a date axis's data, e.g. a padded axis end) are shown as the number. O(1).
 * @example formatSerial(45356) // → '2024-03-05'
 * @example formatSerial(45356.6041666667) // → '2024-03-05 14:30'
 */
export function formatSerial(serial: number): string {
  if (!Number.isFinite(serial) || serial < 1) return String(serial);
  const day = Math.floor(serial);
  const seconds = Math.round((serial - day) * 86400);
  const whole = seconds === 86400 ? day + 1 : day;
  const secs = seconds === 86400 ? 0 : seconds;
  const date = whole === 60 ? '1900-02-29' : dateOfSerial(whole).toISOString().slice(0, 10);
  if (secs === 0) return date;
  const hh = Math.floor(secs / 3600);
  const mm = Math.floor((secs % 3600) / 60);
  const ss = secs % 60;
  return `${date} ${pad(hh)}:${pad(mm)}${ss === 0 ? '' : `:${pad(ss)}`}`;
}

/**
 * The tick-label function for a chart axis over x of the given kind: dates for a date column
 * ({@link formatSerial}), the number as it is otherwise. O(1) per label.
 * @example axisLabel('date')(45356) // → '2024-03-05'
 */
export function axisLabel(kind: 'number' | 'date'): (value: number) => string {
  return kind === 'date' ? formatSerial : (v) => String(v);
}
