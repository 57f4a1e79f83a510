/**
 * The quantities the charts plot, each with its unit, so every axis label and every read-out
 * names one. The engine stores SI base units (s, V, A, °C) and mAh; charts convert time only.
 */
import { formatNumber, missing } from "@/lib/notebook/format";

export interface Quantity {
  label: string;
  unit: string;
  /** Decimals in read-outs. */
  decimals: number;
}

export const quantities = {
  voltage: { label: "Voltage", unit: "V", decimals: 3 },
  current: { label: "Current", unit: "A", decimals: 3 },
  temperature: { label: "Temperature", unit: "°C", decimals: 1 },
  capacity: { label: "Capacity", unit: "mAh", decimals: 1 },
  incrementalCapacity: { label: "dQ/dV", unit: "mAh/V", decimals: 0 },
  resistance: { label: "DC resistance", unit: "mΩ", decimals: 1 },
  cycle: { label: "Cycle", unit: "number", decimals: 0 },
  count: { label: "Cells", unit: "count", decimals: 0 },
} as const satisfies Record<string, Quantity>;

/** "Voltage (V)": the label every axis carries. */
export function axisLabel(q: Quantity): string {
  return `${q.label} (${q.unit})`;
}

/** A read-out value with its unit ("4.200 V"); counts and cycle numbers go without one. */
export function readout(value: number | null | undefined, q: Quantity): string {
  const text = formatNumber(value, q.decimals);
  if (text === missing) return missing;
  return q.unit === "number" || q.unit === "count" ? text : `${text}\u00a0${q.unit}`;
}

export interface TimeScale {
  unit: "s" | "min" | "h";
  /** Seconds in one unit. */
  secondsPer: number;
  quantity: Quantity;
}

const timeScales: TimeScale[] = [
  { unit: "s", secondsPer: 1, quantity: { label: "Time", unit: "s", decimals: 1 } },
  // 1 min = 60 s and 1 h = 3600 s: non-SI units accepted for use with the SI (SI Brochure, 9th ed., Table 8).
  { unit: "min", secondsPer: 60, quantity: { label: "Time", unit: "min", decimals: 2 } },
  { unit: "h", secondsPer: 3600, quantity: { label: "Time", unit: "h", decimals: 3 } },
];

/**
 * The time unit for a run of this length: seconds up to 2 minutes, minutes up to 2 hours, hours
 * beyond, so the axis shows numbers a person reads at a glance (a 39,170 s log reads 10.9 h).
 */
export function timeScaleFor(durationS: number): TimeScale {
  const [seconds, minutes, hours] = timeScales as [TimeScale, TimeScale, TimeScale];
  if (!(durationS > 120)) return seconds;
  if (durationS <= 7200) return minutes;
  return hours;
}

export function toTimeUnit(seconds: readonly number[], scale: TimeScale): number[] {
  return seconds.map((s) => s / scale.secondsPer);
}
