import { protocol, simulate, toCsv } from "./sim";

/**
 * An invented capacity check of a 1000 mAh pouch cell, from the project's simulator: a CC-CV
 * charge at 0.5C to 4.2 V with C/20 termination, a rest, and a 0.5C discharge to 3.0 V (the
 * usual polymer-cell limits: common practice, no source), logged with a little measurement noise
 * (1 mV, 1 mA). `seed` varies the noise, so two logs with different seeds are different bytes.
 */
export function capacityCheckCsv(seed = 1, options: { logInterval_s?: number } = {}): string {
  const plan = protocol().ccCvCharge(0.5, 4.2, 0.05).rest(600).ccDischarge(0.5, 3.0).rest(300).build();
  const { samples } = simulate(plan, { ratedCapacity_mAh: 1000, initialSoc: 0.02, logInterval_s: options.logInterval_s ?? 10, voltageNoise_V: 0.001, currentNoise_A: 0.001, seed });
  return toCsv(samples);
}

/**
 * Charge in and out of a time/voltage/current CSV by the trapezoidal rule (any numerical-analysis
 * handbook), positive current charging: an independent reckoning to check stored totals against.
 */
export function trapezoidTotals_mAh(csv: string): { charged: number; discharged: number } {
  const rows = csv
    .trim()
    .split("\n")
    .slice(1)
    .map((line) => line.split(",").map(Number));
  let charged = 0;
  let discharged = 0;
  for (let k = 1; k < rows.length; k++) {
    const [t0 = 0, , i0 = 0] = rows[k - 1] ?? [];
    const [t1 = 0, , i1 = 0] = rows[k] ?? [];
    const q = ((i0 + i1) / 2) * (t1 - t0); // A·s
    if (q > 0) charged += q;
    else discharged -= q;
  }
  return { charged: charged / 3.6, discharged: discharged / 3.6 };
}

/** A log that breaks off into text in a voltage cell on data line 5 (physical line 6). */
export const malformedCsv = "time_s,voltage_V,current_A\n0,3.70,0.5\n10,3.71,0.5\n20,3.72,0.5\n30,3.73,0.5\n40,abc,0.5\n50,3.75,0.5\n";
