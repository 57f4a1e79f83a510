/**
 * Detection thresholds, scaled to the noise the log actually has.
 * Every constant here is our own engineering choice (no source), chosen so that
 * Gaussian noise of ~20 mV / ~50 mA on a 1–2 Ah cell at 1 s logging produces
 * essentially no false step edges over 10⁷ samples while real edges of a few
 * noise-σ are still found. Tests in tests/analysis/analyse-*.test.ts exercise them.
 */
export interface Thresholds {
  /** Estimated σ of current noise, A. */
  sigmaI: number;
  /** Estimated σ of voltage noise, V. */
  sigmaV: number;
  /** Smallest current that is not a rest: max(σ_I, floor). A 16-sample mean of pure noise stays below it at 4σ. */
  restCurrent: number;
  /** Absolute floor for current thresholds: 0.2 % of 1C when the rated capacity is known, else of the largest |I| seen. */
  floorCurrent: number;
  /** 1C in amperes when the rated capacity is known, else NaN. */
  oneC: number;
}

export const edge = {
  /** Samples after a candidate edge that must sit at the new level (ignores 1–2 sample spikes). */
  postSamples: 3,
  /** Samples before a candidate edge used for the old level. */
  preSamples: 8,
  /** Edge when |post − pre| exceeds this many σ of the difference of the two means... */
  sigmas: 5,
  /** ...and this fraction of the larger level (regulation ripple is not an edge). */
  relative: 0.05,
  /** Edge only if a step fits the window at least this much better (SSE ratio) than a straight line. */
  stepVersusLine: 0.5,
};

export const regime = {
  postSamples: 16,
  preSamples: 32,
  /** Leaving rest needs |mean| above restCurrent × this (hysteresis). */
  activeFactor: 1.5,
};

/** Voltage band for "the voltage stayed at its plateau" between two window means. */
export function voltageBand(th: Thresholds, nA: number, nB: number): number {
  return Math.max(4 * th.sigmaV * Math.sqrt(1 / nA + 1 / nB), 0.003);
}
