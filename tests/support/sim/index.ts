/**
 * Simulated cell logs with exact ground truth, for testing the analysis engine.
 * See chen-2006.ts for the model source and simulate.ts for the integration.
 */
export { protocol, ProtocolBuilder, stepKindOf, type PlannedStep, type ProtocolStep } from "./protocol";
export {
  simulate,
  type SimulationOptions,
  type SimulationResult,
  type SampledSeries,
  type Truth,
  type TruthStep,
  type TruthCycle,
  type TruthCharge,
  type TruthCurrentStep,
  type ThermalOptions,
  type EndReason,
} from "./simulate";
export { toBatches, toCsv, type BatchOptions } from "./batches";
export { openCircuitVoltage, cellParameters, referenceCapacity_mAh } from "./chen-2006";
export { createPrng, type Prng } from "./prng";

import { protocol } from "./protocol";

/** A typical capacity check: CC-CV charge, rest, CC discharge, n times. */
export function standardCycles(n: number, o: { chargeC?: number; dischargeC?: number; termC?: number; restS?: number } = {}) {
  return protocol()
    .repeat(n, (b) => {
      b.ccCvCharge(o.chargeC ?? 0.5, 4.2, o.termC ?? 0.05)
        .rest(o.restS ?? 600)
        .ccDischarge(o.dischargeC ?? 0.5, 3.0)
        .rest(o.restS ?? 600);
    })
    .build();
}
