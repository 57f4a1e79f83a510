/**
 * Process capability against specification limits, NIST/SEMATECH e-Handbook §6.1.6
 * ("What is process capability?"): Cp = (USL − LSL)/(6σ), Cpk = min(Cpu, Cpl),
 * Cpu = (USL − μ)/(3σ), Cpl = (μ − LSL)/(3σ); one-sided Cpl or Cpu when only one limit exists
 * (delivered capacity usually has only a lower limit). σ is the sample standard deviation of the
 * batch, so strictly these are overall ("performance") indices. Verdict bands as the handbook
 * describes them: below 1 not capable, 1 to 1.33 marginal, 1.33 and above capable.
 */

export interface SpecLimits {
  lsl?: number | null;
  usl?: number | null;
}

export type CapabilityVerdict = "not capable" | "marginal" | "capable";

export interface Capability {
  cp: number | null;
  cpk: number | null;
  cpl: number | null;
  cpu: number | null;
  /** The index the verdict is read from: Cpk with two limits, else the one-sided index. */
  index: "Cpk" | "Cpl" | "Cpu";
  value: number;
  verdict: CapabilityVerdict;
}

export const CAPABLE_AT = 1.33;
export const MARGINAL_AT = 1;

export function verdictFor(index: number): CapabilityVerdict {
  if (index >= CAPABLE_AT) return "capable";
  if (index >= MARGINAL_AT) return "marginal";
  return "not capable";
}

function present(limit: number | null | undefined): limit is number {
  return limit !== null && limit !== undefined && Number.isFinite(limit);
}

/**
 * Capability indices from a mean and standard deviation. Null without any limit or without a
 * positive standard deviation (a spread of zero has no capability ratio).
 */
export function capabilityIndices(mean: number, sd: number | null, spec: SpecLimits): Capability | null {
  if (sd === null || !(sd > 0)) return null;
  const { lsl, usl } = spec;
  const hasL = present(lsl);
  const hasU = present(usl);
  if (hasL && hasU && !(usl > lsl)) throw new RangeError(`upper limit ${usl} must be above lower limit ${lsl}`);
  const cpl = hasL ? (mean - lsl) / (3 * sd) : null;
  const cpu = hasU ? (usl - mean) / (3 * sd) : null;
  if (cpl !== null && cpu !== null) {
    const cpk = Math.min(cpl, cpu);
    return { cp: ((usl as number) - (lsl as number)) / (6 * sd), cpk, cpl, cpu, index: "Cpk", value: cpk, verdict: verdictFor(cpk) };
  }
  if (cpl !== null) return { cp: null, cpk: null, cpl, cpu: null, index: "Cpl", value: cpl, verdict: verdictFor(cpl) };
  if (cpu !== null) return { cp: null, cpk: null, cpl: null, cpu, index: "Cpu", value: cpu, verdict: verdictFor(cpu) };
  return null;
}
