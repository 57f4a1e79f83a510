/**
 * A small builder for charge/discharge test protocols run by the simulator.
 * Currents are given as C-rates of the rated capacity (1C = rated capacity in mA,
 * common practice, no source) and are positive while charging.
 */
import type { StepKind } from "@/lib/analysis/types";

export type ProtocolStep =
  | { type: "rest"; duration_s: number }
  | { type: "cc-charge"; cRate: number; untilVoltage_V: number; maxDuration_s?: number }
  | { type: "cv-hold"; voltage_V: number; untilCRate: number; maxDuration_s?: number }
  | { type: "cc-discharge"; cRate: number; untilVoltage_V: number; maxDuration_s?: number }
  /** A fixed current for a fixed time; signed C-rate, negative discharges. */
  | { type: "pulse"; cRate: number; duration_s: number };

export interface PlannedStep {
  step: ProtocolStep;
  /** 1-based cycle number the step belongs to (a cycle is a charge followed by its discharge). */
  cycle: number;
  /** 1-based step number, as a cycler would write it into a step column. */
  index: number;
}

export function stepKindOf(step: ProtocolStep): StepKind {
  switch (step.type) {
    case "rest":
      return "rest";
    case "cc-charge":
      return "constant-current charge";
    case "cv-hold":
      return "constant-voltage charge";
    case "cc-discharge":
      return "constant-current discharge";
    case "pulse":
      return "other";
  }
}

export class ProtocolBuilder {
  private readonly steps: PlannedStep[] = [];
  private cycle = 1;
  private sawDischargeInCycle = false;
  private sawAnyStep = false;

  private push(step: ProtocolStep): this {
    // A charge after a discharge opens the next cycle, the convention the analyser uses too.
    const charging = step.type === "cc-charge" || step.type === "cv-hold";
    if (charging && this.sawDischargeInCycle) {
      this.cycle += 1;
      this.sawDischargeInCycle = false;
    }
    if (step.type === "cc-discharge") this.sawDischargeInCycle = true;
    this.sawAnyStep = true;
    this.steps.push({ step, cycle: this.cycle, index: this.steps.length + 1 });
    return this;
  }

  rest(duration_s: number): this {
    return this.push({ type: "rest", duration_s });
  }

  ccCharge(cRate: number, untilVoltage_V: number, maxDuration_s?: number): this {
    return this.push({ type: "cc-charge", cRate, untilVoltage_V, maxDuration_s });
  }

  cvHold(voltage_V: number, untilCRate: number, maxDuration_s?: number): this {
    return this.push({ type: "cv-hold", voltage_V, untilCRate, maxDuration_s });
  }

  /** Constant current to the voltage limit, then constant voltage until the current falls to `terminationCRate`. */
  ccCvCharge(cRate: number, voltage_V: number, terminationCRate: number, maxCvDuration_s?: number): this {
    return this.ccCharge(cRate, voltage_V).cvHold(voltage_V, terminationCRate, maxCvDuration_s);
  }

  ccDischarge(cRate: number, untilVoltage_V: number, maxDuration_s?: number): this {
    return this.push({ type: "cc-discharge", cRate, untilVoltage_V, maxDuration_s });
  }

  pulse(cRate: number, duration_s: number): this {
    return this.push({ type: "pulse", cRate, duration_s });
  }

  /**
   * The DC internal resistance sequence of IEC 61960-3 §7.7 as summarised in the
   * domain notes (from memory): discharge at 0.2 It for 10 s, then at 1 It for 1 s.
   */
  iecDcResistance(): this {
    return this.pulse(-0.2, 10).pulse(-1, 1);
  }

  /** Repeats `body` n times; each repetition with a charge then a discharge is one cycle. */
  repeat(n: number, body: (b: this, k: number) => void): this {
    for (let k = 0; k < n; k++) body(this, k);
    return this;
  }

  build(): PlannedStep[] {
    if (!this.sawAnyStep) throw new Error("empty protocol");
    return this.steps.slice();
  }
}

export function protocol(): ProtocolBuilder {
  return new ProtocolBuilder();
}
