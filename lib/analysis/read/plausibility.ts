/**
 * Values that cannot be what the header says they are, with a hint at the unit
 * they probably are in. Judged on medians of the first rows so one glitch does
 * not reject a file. Ranges: a single lithium cell sits between about 2.5 and
 * 4.35 V (common practice, no source); small packs reach tens of volts, so
 * 60 V is the ceiling here.
 */
import { reject } from "./reject";
import type { ReadPlan } from "./plan";

function medianOf(values: Float64Array, n: number, filter: (x: number) => boolean): number {
  const picked: number[] = [];
  for (let k = 0; k < n; k++) {
    const x = values[k]!;
    if (!Number.isNaN(x) && filter(x)) picked.push(x);
  }
  if (picked.length === 0) return Number.NaN;
  picked.sort((a, b) => a - b);
  return picked[picked.length >> 1]!;
}

function firstLine(values: Float64Array, lines: Int32Array, n: number, bad: (x: number) => boolean): number {
  for (let k = 0; k < n; k++) if (bad(values[k]!)) return lines[k]!;
  return lines[0] ?? 0;
}

function range(values: Float64Array, n: number, scale: number): string {
  let lo = Infinity;
  let hi = -Infinity;
  for (let k = 0; k < n; k++) {
    const x = values[k]!;
    if (Number.isNaN(x)) continue;
    lo = Math.min(lo, x);
    hi = Math.max(hi, x);
  }
  const fmt = (x: number) => String(Math.round(x * scale * 1000) / 1000);
  return `${fmt(lo)} to ${fmt(hi)}`;
}

export interface ProbeRows {
  n: number;
  line: Int32Array;
  v: Float64Array;
  i: Float64Array;
  temp: Float64Array;
}

export function checkPlausible(plan: ReadPlan, rows: ProbeRows): void {
  const { n } = rows;
  if (n === 0) return;
  const name = (index: number) => `Column ${index + 1} ("${plan.header[index] ?? ""}")`;
  const vIndex = plan.fields.voltage;
  const vMedian = medianOf(rows.v, n, () => true);
  const vWritten = `${range(rows.v, n, plan.voltDiv)} ${plan.voltUnit}`;
  if (vMedian > 60 || vMedian < -0.5 || (plan.voltUnit === "mV" && Math.abs(vMedian) < 0.02)) {
    let hint = "";
    if (plan.voltUnit === "V" && vMedian >= 1000 && vMedian <= 60000) hint = " That looks like millivolts: map the column with unit mV.";
    else if (plan.voltUnit === "mV" && Math.abs(vMedian) < 0.02) hint = " That looks like volts, not millivolts: map the column with unit V.";
    else if (vMedian < 0) hint = " A negative cell voltage usually means swapped sense leads.";
    const line = firstLine(rows.v, rows.line, n, (x) => x > 60 || x < -0.5 || (plan.voltUnit === "mV" && Math.abs(x) < 0.02));
    reject("implausible-values", `${name(vIndex)} holds voltages from ${vWritten}, which no cell shows.${hint}`, { line, column: vIndex + 1 });
  }
  const iIndex = plan.fields.current;
  const iMedian = medianOf(rows.i, n, (x) => x !== 0);
  if (Math.abs(iMedian) > 500) {
    const hint = plan.ampUnit === "A" ? " That looks like milliamperes: map the column with unit mA." : "";
    const line = firstLine(rows.i, rows.line, n, (x) => Math.abs(x) > 500);
    reject(
      "implausible-values",
      `${name(iIndex)} holds currents from ${range(rows.i, n, plan.ampDiv)} ${plan.ampUnit}, far beyond a cell test.${hint}`,
      { line, column: iIndex + 1 },
    );
  }
  const tIndex = plan.fields.temperature;
  if (tIndex >= 0) {
    const tMedian = medianOf(rows.temp, n, () => true);
    if (tMedian > 150 || tMedian < -80) {
      const hint = plan.tempUnit === "degC" && tMedian >= 200 && tMedian <= 400 ? " That looks like kelvin: map the column with unit K." : "";
      const line = firstLine(rows.temp, rows.line, n, (x) => x > 150 || x < -80);
      reject("implausible-values", `${name(tIndex)} holds temperatures around ${Math.round(tMedian)} °C, which no cell test reaches.${hint}`, {
        line,
        column: tIndex + 1,
      });
    }
  }
}
