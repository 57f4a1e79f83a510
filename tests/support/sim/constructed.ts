/** Hand-constructed logs (no cell model) for checks with a known answer. */
import type { SampledSeries } from "./simulate";

export interface Segment {
  duration_s: number;
  /** Current in A (positive charges) at time τ seconds into the segment. */
  i: number | ((tau: number) => number);
  /** Voltage in V at τ, given the current. */
  v: number | ((tau: number, i: number) => number);
  temp?: number | ((tau: number) => number);
  step?: number;
}

/**
 * Samples the segments every `dt` seconds. A row falls on each segment's start; the last row is
 * written at the very end. Every segment starts a new step number unless `step` says otherwise.
 */
export function constructLog(segments: Segment[], dt: number, withTemperature = false): SampledSeries {
  const t: number[] = [];
  const v: number[] = [];
  const i: number[] = [];
  const temp: number[] = [];
  const step: number[] = [];
  let start = 0;
  segments.forEach((s, k) => {
    const n = Math.round(s.duration_s / dt);
    const last = k === segments.length - 1;
    for (let m = 0; m < n + (last ? 1 : 0); m++) {
      const tau = m * dt;
      const cur = typeof s.i === "function" ? s.i(tau) : s.i;
      t.push(start + tau);
      i.push(cur);
      v.push(typeof s.v === "function" ? s.v(tau, cur) : s.v);
      temp.push(s.temp === undefined ? 25 : typeof s.temp === "function" ? s.temp(tau) : s.temp);
      step.push(s.step ?? k + 1);
    }
    start += n * dt;
  });
  return {
    length: t.length,
    t: Float64Array.from(t),
    v: Float64Array.from(v),
    i: Float64Array.from(i),
    temp: withTemperature ? Float64Array.from(temp) : null,
    step: Float64Array.from(step),
    cycle: new Float64Array(t.length).fill(1),
  };
}
