/**
 * Calendar arithmetic shared by both parsing paths, so a timestamp gives the
 * same double whichever path read it.
 */

/** Days from 1970-01-01 to the given proleptic Gregorian date (H. Hinnant's days_from_civil, from memory; tested against Date.UTC). */
export function daysFromCivil(year: number, month: number, day: number): number {
  const y = month <= 2 ? year - 1 : year;
  const era = Math.floor(y / 400);
  const yoe = y - era * 400;
  const doy = Math.floor((153 * (month + (month > 2 ? -3 : 9)) + 2) / 5) + day - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146097 + doe - 719468;
}

const daysInMonth = [31, 29, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

export function validDate(year: number, month: number, day: number): boolean {
  if (month < 1 || month > 12 || day < 1) return false;
  const limit = daysInMonth[month - 1] ?? 0;
  if (day > limit) return false;
  if (month === 2 && day === 29) return year % 4 === 0 && (year % 100 !== 0 || year % 400 === 0);
  return true;
}

/**
 * Whole seconds since 1970-01-01T00:00:00Z. A timestamp without an offset is
 * taken as UTC: only differences between rows matter.
 */
export function wholeSeconds(
  year: number,
  month: number,
  day: number,
  hour: number,
  minute: number,
  second: number,
  offsetMinutes: number,
): number {
  return daysFromCivil(year, month, day) * 86400 + hour * 3600 + minute * 60 + second - offsetMinutes * 60;
}

/** Elapsed hh:mm:ss(.sss): the same arithmetic order in both paths. */
export function hmsSeconds(hours: number, minutes: number, seconds: number): number {
  return hours * 3600 + minutes * 60 + seconds;
}
