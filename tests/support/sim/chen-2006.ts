/**
 * Thevenin cell model parameters after Chen & Rincón-Mora, "Accurate electrical
 * battery model capable of predicting runtime and I–V performance",
 * IEEE Trans. Energy Convers. 21(2) (2006) 504–511.
 *
 * The coefficients below are the ones reproduced in public code for that paper
 * (see /work/shared/notes/domain.md); they were fitted to a polymer lithium-ion
 * cell of about 850 mAh. Which parts are ours / from memory:
 * - the two-RC Thevenin structure and the sign convention (charge positive) are
 *   the usual textbook form (from memory);
 * - scaling to another rated capacity is our own rule: resistances scale with
 *   850 / capacity and capacitances with capacity / 850, so every RC time
 *   constant is unchanged and the voltage response at the same C-rate is the same;
 * - the lumped thermal model in simulate.ts is our own, not from the paper.
 */

/** Rated capacity of the cell the coefficients were fitted to, mAh. */
export const referenceCapacity_mAh = 850;

export interface CellParameters {
  voc_V: number;
  rSeries_ohm: number;
  rShort_ohm: number;
  cShort_F: number;
  rLong_ohm: number;
  cLong_F: number;
}

/** Open-circuit voltage as a function of state of charge (0..1), volts. */
export function openCircuitVoltage(soc: number): number {
  return -1.031 * Math.exp(-35 * soc) + 3.685 + 0.2156 * soc - 0.1178 * soc * soc + 0.3201 * soc * soc * soc;
}

/**
 * Parameters at a state of charge for a cell of `capacity_mAh`, written into `out`
 * so the integrator's inner loop allocates nothing.
 */
export function cellParameters(soc: number, capacity_mAh: number, out: CellParameters): CellParameters {
  const rScale = referenceCapacity_mAh / capacity_mAh;
  const cScale = capacity_mAh / referenceCapacity_mAh;
  out.voc_V = openCircuitVoltage(soc);
  out.rSeries_ohm = (0.1562 * Math.exp(-24.37 * soc) + 0.07446) * rScale;
  out.rShort_ohm = (0.3208 * Math.exp(-29.14 * soc) + 0.04669) * rScale;
  out.cShort_F = (-752.9 * Math.exp(-13.51 * soc) + 703.6) * cScale;
  out.rLong_ohm = (6.603 * Math.exp(-155.2 * soc) + 0.04984) * rScale;
  out.cLong_F = (-6056 * Math.exp(-27.12 * soc) + 4475) * cScale;
  return out;
}

export function emptyParameters(): CellParameters {
  return { voc_V: 0, rSeries_ohm: 0, rShort_ohm: 0, cShort_F: 0, rLong_ohm: 0, cLong_F: 0 };
}
