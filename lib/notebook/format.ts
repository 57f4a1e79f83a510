/**
 * How the notebook pages write numbers: fixed decimals per quantity, a true minus sign (U+2212,
 * which screen readers and print keep apart from a hyphen), and a dash for a missing value.
 * Pure functions, used by server and client components alike.
 */

export const missing = "—";

const minus = "\u2212";

/** A finite number with fixed decimals, or the dash for null, NaN and infinities. */
export function formatNumber(value: number | null | undefined, decimals: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return missing;
  const text = Math.abs(value).toFixed(decimals);
  // -0.0004 rounds to "0.000": no minus sign on a zero.
  return value < 0 && Number(text) !== 0 ? `${minus}${text}` : text;
}

/** A number and its unit, separated by a no-break space so they never wrap apart. */
export function withUnit(value: number | null | undefined, decimals: number, unit: string): string {
  const text = formatNumber(value, decimals);
  return text === missing ? missing : `${text}\u00a0${unit}`;
}

export const formatMah = (mAh: number | null | undefined): string => withUnit(mAh, 1, "mAh");
export const formatWh = (Wh: number | null | undefined): string => withUnit(Wh, 3, "Wh");
export const formatVolts = (V: number | null | undefined): string => withUnit(V, 3, "V");
export const formatAmps = (A: number | null | undefined): string => withUnit(A, 3, "A");
export const formatMilliohm = (mOhm: number | null | undefined): string => withUnit(mOhm, 1, "mΩ");
export const formatCelsius = (C: number | null | undefined): string => withUnit(C, 1, "°C");

/** A ratio (0.998) as a percentage ("99.80 %"); `decimals` of the percentage. */
export function formatPercent(ratio: number | null | undefined, decimals = 1): string {
  if (ratio === null || ratio === undefined || !Number.isFinite(ratio)) return missing;
  return withUnit(ratio * 100, decimals, "%");
}

/**
 * A duration in seconds as h:mm:ss; hours run past 24 ("151:24:02") because bench logs do.
 * `tenths` keeps one decimal of the seconds, for the short times of a resistance pulse.
 */
export function formatClock(seconds: number | null | undefined, options: { tenths?: boolean } = {}): string {
  if (seconds === null || seconds === undefined || !Number.isFinite(seconds)) return missing;
  const sign = seconds < 0 ? minus : "";
  const scale = options.tenths ? 10 : 1;
  // Round once, in the smallest unit shown, so 59.96 s becomes 0:01:00.0 and never 0:00:60.0.
  const total = Math.round(Math.abs(seconds) * scale);
  const whole = Math.floor(total / scale);
  const h = Math.floor(whole / 3600);
  const m = Math.floor((whole % 3600) / 60);
  const s = whole % 60;
  const fraction = options.tenths ? `.${total % scale}` : "";
  return `${sign}${h}:${String(m).padStart(2, "0")}:${String(s).padStart(2, "0")}${fraction}`;
}

/**
 * A current as a C-rate the way the trade writes small ones: C/x with x = rated capacity / current,
 * rounded to a whole number (0.08 A on a 1000 mAh cell is C/12). Currents of 1C and more are
 * written as a multiple ("2C"). Null without a rated capacity or a current.
 */
export function formatCRate(currentA: number | null | undefined, ratedMah: number | null | undefined): string {
  if (currentA === null || currentA === undefined || ratedMah === null || ratedMah === undefined) return missing;
  const fraction = Math.abs(currentA) / (ratedMah / 1000);
  if (!Number.isFinite(fraction) || fraction <= 0) return missing;
  if (fraction >= 1) return `${Number(fraction.toFixed(2))}C`;
  return `C/${Math.round(1 / fraction)}`;
}

/** A date and time for a record header: "2026-11-20 08:15" in the reader's time zone. */
export function formatDateTime(value: Date | string): string {
  const date = typeof value === "string" ? new Date(value) : value;
  if (Number.isNaN(date.getTime())) return missing;
  const pad = (n: number) => String(n).padStart(2, "0");
  return `${date.getFullYear()}-${pad(date.getMonth() + 1)}-${pad(date.getDate())} ${pad(date.getHours())}:${pad(date.getMinutes())}`;
}

/** A time for a printed record: UTC to the minute and saying so, since paper has no time zone. */
export function formatUtc(value: Date | string): string {
  const date = typeof value === "string" ? new Date(value) : value;
  if (Number.isNaN(date.getTime())) return missing;
  return `${date.toISOString().slice(0, 16).replace("T", " ")} UTC`;
}
