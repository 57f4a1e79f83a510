/**
 * Safety findings against the cell's limits (CellLimits). Rules are our own (no source):
 * - over-voltage: V > charge limit + tolerance (default 0.05 V, domain notes "±50 mV typical", from memory);
 * - under-voltage: V < discharge cut-off − 0.05 V (same allowance, our choice);
 * - charge / discharge over-current: |I| > limit·1C·1.05 (5 % allowance for regulation; needs the rated capacity);
 * - temperature outside the charge window while charging, outside the discharge window while
 *   discharging (direction from a short moving average of current, so rest noise does not flip it);
 * - CV phase not terminated: from the charge summary (cycles.ts).
 * A violation must hold for at least 3 consecutive samples: one- and two-sample spikes are treated
 * as noise (with 20 mV noise a 2.5σ excursion happens in ~1 % of samples, three in a row in ~10⁻⁷).
 * Violations closer together than max(10 s, 5 logging intervals) merge into one finding that
 * carries its start, end and the worst 3-sample mean (less noise-driven than a single sample).
 * Cautions are plain words of our own and defer to local codes, the cell maker's data sheet and
 * the lab's own procedures.
 */
import { ringMask, type SampleRing } from "./ring";
import type { Thresholds } from "./thresholds";
import type { CellLimits, Finding, FindingKind, Severity } from "./types";

const MASK = ringMask;

const persistSamples = 3;
const maxFindingsPerKind = 200;
export const defaultVoltageTolerance_V = 0.05;
const currentAllowance = 1.05;

const defer = "Follow the cell maker's data sheet, your lab's safety procedures and local codes.";

export const cautions: Record<"overVoltage" | "underVoltage" | "overCurrent" | "hot" | "cold" | "cvOpen", string> = {
  overVoltage: `Charging a lithium cell above its voltage limit can make it swell, vent, catch fire or explode. Stop using the cell until it has been checked, and check the charger settings. ${defer}`,
  underVoltage: `Discharging a lithium cell below its cut-off can damage it, and a cell taken far below it may be unsafe to charge again. ${defer}`,
  overCurrent: `Current above the cell's rated limit heats it and can damage it or make it fail dangerously. Check the test settings. ${defer}`,
  hot: `A lithium cell that is too hot can go into thermal runaway. If it is hot, swollen, leaking or smells of solvent, stop the test and keep clear. ${defer}`,
  cold: `Charging or discharging a lithium cell below its temperature window can damage it (charging in the cold can plate lithium and make the cell unsafe later). ${defer}`,
  cvOpen: `The charge ended before its current fell to the termination value, so the cell may not be full and the capacity measured next may read low. This alone is not a hazard; check the charge settings. ${defer}`,
};

interface CheckSpec {
  kind: FindingKind;
  limit: number;
  /** Reported limit (without tolerance), for the message. */
  nominal: number;
  above: boolean;
  unit: string;
  severity: (worst: number) => Severity;
  caution: string;
  describe: (worst: number, start: number, end: number) => string;
}

/** One limit watched sample by sample. */
class LimitWatch {
  private streak = 0;
  private streakStartT = 0;
  private streakStartLine = 0;
  private a = 0;
  private b = 0;
  private inEvent = false;
  private eventStart = 0;
  private eventLine = 0;
  private eventEnd = 0;
  private worst = NaN;
  readonly out: Finding[] = [];
  extra = 0;

  constructor(readonly spec: CheckSpec) {}

  /** True while a streak or an event is open: then every sample must be seen. */
  get busy(): boolean {
    return this.streak > 0 || this.inEvent;
  }

  update(r: SampleRing, n: number, x: number, active: boolean, mergeGap: number): void {
    const s = this.spec;
    const t = r.t[n & MASK] ?? 0;
    const line = r.line[n & MASK] ?? 0;
    const beyond = active && (s.above ? x > s.limit : x < s.limit);
    if (!beyond) {
      // The common case: nothing to do unless an event is waiting to be closed.
      if (this.inEvent && t - this.eventEnd > mergeGap) this.close();
      this.streak = 0;
      return;
    }
    if (this.inEvent && this.streak === 0 && t - this.eventEnd > mergeGap) this.close();
    if (this.streak === 0) {
      this.streakStartT = t;
      this.streakStartLine = line;
    }
    this.streak += 1;
    const c = this.b;
    this.b = this.a;
    this.a = x;
    if (this.streak < persistSamples) return;
    // The two samples before this one are in the streak, so the 3-sample mean is of violating samples.
    const mean3 = (x + this.b + c) / 3;
    if (!this.inEvent) {
      this.inEvent = true;
      this.eventStart = this.streakStartT;
      this.eventLine = this.streakStartLine;
      this.worst = mean3;
    } else if (s.above ? mean3 > this.worst : mean3 < this.worst) this.worst = mean3;
    this.eventEnd = t;
  }

  finish(): void {
    if (this.inEvent) this.close();
  }

  private close(): void {
    this.inEvent = false;
    if (this.out.length >= maxFindingsPerKind) {
      this.extra += 1;
      return;
    }
    const s = this.spec;
    this.out.push({
      kind: s.kind,
      severity: s.severity(this.worst),
      time_s: this.eventStart,
      end_s: this.eventEnd,
      line: this.eventLine,
      value: this.worst,
      limit: s.nominal,
      unit: s.unit,
      message: s.describe(this.worst, this.eventStart, this.eventEnd),
      caution: s.caution,
    });
  }
}

const fmt = (x: number, d: number): string => x.toFixed(d);
const span = (a: number, b: number): string => `from ${fmt(a, 1)} s to ${fmt(b, 1)} s`;

export class SafetyMonitor {
  private overV: LimitWatch | null = null;
  private underV: LimitWatch | null = null;
  private readonly iCharge: LimitWatch | null = null;
  private readonly iDischarge: LimitWatch | null = null;
  private readonly tCharge: LimitWatch[] = [];
  private readonly tDischarge: LimitWatch[] = [];
  private tChargeHi: LimitWatch | null = null;
  private tChargeLo: LimitWatch | null = null;
  private tDischargeHi: LimitWatch | null = null;
  private tDischargeLo: LimitWatch | null = null;
  private iAvg = 0;

  constructor(limits: CellLimits) {
    const tol = limits.chargeVoltageTolerance_V ?? defaultVoltageTolerance_V;
    const vMax = limits.chargeVoltageLimit_V;
    if (vMax !== undefined) {
      this.overV = new LimitWatch({
          kind: "over-voltage",
          limit: vMax + tol,
          nominal: vMax,
          above: true,
          unit: "V",
          severity: () => "danger",
          caution: cautions.overVoltage,
          describe: (w, a, b) => `Voltage rose to ${fmt(w, 3)} V, above the charge limit of ${fmt(vMax, 2)} V (allowing ${fmt(tol * 1000, 0)} mV), ${span(a, b)}.`,
      });
    }
    const vMin = limits.dischargeCutoff_V;
    if (vMin !== undefined) {
      this.underV = new LimitWatch({
          kind: "under-voltage",
          limit: vMin - defaultVoltageTolerance_V,
          nominal: vMin,
          above: false,
          unit: "V",
          severity: (w) => (w < vMin - 0.5 ? "danger" : "warning"),
          caution: cautions.underVoltage,
          describe: (w, a, b) => `Voltage fell to ${fmt(w, 3)} V, below the discharge cut-off of ${fmt(vMin, 2)} V, ${span(a, b)}.`,
      });
    }
    const rated = limits.ratedCapacity_mAh;
    const oneC = rated !== undefined && rated > 0 ? rated / 1000 : NaN;
    const currentWatch = (kind: FindingKind, c: number | undefined, doing: string): LimitWatch | null => {
      if (!(oneC === oneC) || c === undefined) return null;
      const lim = c * oneC;
      return new LimitWatch({
        kind,
        limit: lim * currentAllowance,
        nominal: lim,
        above: true,
        unit: "A",
        severity: (w) => (w > 1.5 * lim ? "danger" : "warning"),
        caution: cautions.overCurrent,
        describe: (w, a, b) => `${doing} current reached ${fmt(w, 3)} A (${fmt(w / oneC, 2)}C), above the limit of ${fmt(lim, 3)} A (${c}C), ${span(a, b)}.`,
      });
    };
    this.iCharge = currentWatch("charge-over-current", limits.maxChargeC, "Charge");
    this.iDischarge = currentWatch("discharge-over-current", limits.maxDischargeC, "Discharge");
    const windows: [FindingKind, { min: number; max: number } | undefined, LimitWatch[], string][] = [
      ["charge-temperature", limits.chargeTemp_C, this.tCharge, "charging"],
      ["discharge-temperature", limits.dischargeTemp_C, this.tDischarge, "discharging"],
    ];
    for (const [kind, w, list, doing] of windows) {
      if (!w) continue;
      list.push(
        new LimitWatch({
          kind,
          limit: w.max,
          nominal: w.max,
          above: true,
          unit: "°C",
          severity: (x) => (x > w.max + 5 ? "danger" : "warning"),
          caution: cautions.hot,
          describe: (x, a, b) => `Cell temperature reached ${fmt(x, 1)} °C while ${doing}, above the ${fmt(w.max, 0)} °C limit, ${span(a, b)}.`,
        }),
        new LimitWatch({
          kind,
          limit: w.min,
          nominal: w.min,
          above: false,
          unit: "°C",
          severity: () => "warning",
          caution: cautions.cold,
          describe: (x, a, b) => `Cell temperature was ${fmt(x, 1)} °C while ${doing}, below the ${fmt(w.min, 0)} °C limit, ${span(a, b)}.`,
        }),
      );
    }
    this.tChargeHi = this.tCharge[0] ?? null;
    this.tChargeLo = this.tCharge[1] ?? null;
    this.tDischargeHi = this.tDischarge[0] ?? null;
    this.tDischargeLo = this.tDischarge[1] ?? null;
  }

  /** Merge window for findings, s; the analyser keeps it at max(10 s, 5 logging intervals). */
  mergeGap = 10;

  onSample(r: SampleRing, n: number, th: Thresholds): void {
    const j = n & MASK;
    const v = r.v[j] ?? 0;
    const i = r.i[j] ?? 0;
    const temp = r.temp[j] ?? NaN;
    // Only a watch that sees a violation, or is inside a streak or event, does any work.
    const ov = this.overV;
    if (ov !== null && (v > ov.spec.limit || ov.busy)) ov.update(r, n, v, true, this.mergeGap);
    const uv = this.underV;
    if (uv !== null && (v < uv.spec.limit || uv.busy)) uv.update(r, n, v, true, this.mergeGap);
    const ic = this.iCharge;
    if (ic !== null && (i > ic.spec.limit || ic.busy)) ic.update(r, n, i, true, this.mergeGap);
    const id = this.iDischarge;
    if (id !== null && (-i > id.spec.limit || id.busy)) id.update(r, n, -i, true, this.mergeGap);
    // Direction of current from a short exponential average (about 4 samples).
    this.iAvg += 0.25 * (i - this.iAvg);
    if (temp === temp) {
      const charging = this.iAvg > 1.5 * th.restCurrent;
      const discharging = this.iAvg < -1.5 * th.restCurrent;
      const a = this.tChargeHi;
      if (a !== null && ((charging && temp > a.spec.limit) || a.busy)) a.update(r, n, temp, charging, this.mergeGap);
      const b = this.tChargeLo;
      if (b !== null && ((charging && temp < b.spec.limit) || b.busy)) b.update(r, n, temp, charging, this.mergeGap);
      const c = this.tDischargeHi;
      if (c !== null && ((discharging && temp > c.spec.limit) || c.busy)) c.update(r, n, temp, discharging, this.mergeGap);
      const d = this.tDischargeLo;
      if (d !== null && ((discharging && temp < d.spec.limit) || d.busy)) d.update(r, n, temp, discharging, this.mergeGap);
    }
  }

  finish(): Finding[] {
    const all = [...(this.overV ? [this.overV] : []), ...(this.underV ? [this.underV] : []), ...(this.iCharge ? [this.iCharge] : []), ...(this.iDischarge ? [this.iDischarge] : []), ...this.tCharge, ...this.tDischarge];
    const out: Finding[] = [];
    for (const w of all) {
      w.finish();
      out.push(...w.out);
      if (w.extra > 0) {
        const lastOne = w.out[w.out.length - 1];
        out.push({
          kind: w.spec.kind,
          severity: "info",
          time_s: lastOne?.end_s ?? 0,
          value: w.extra,
          limit: null,
          unit: null,
          message: `${w.extra} more findings of this kind were not listed.`,
          caution: w.spec.caution,
        });
      }
    }
    return out;
  }
}

/** "CV phase not terminated" findings from the charge summaries. */
export function cvNotTerminated(cycles: { cycle: number; charge: { cv: { ended_by: string; final_current_A: number; termination_current_A: number | null; duration_s: number } | null; end_s: number } | null }[]): Finding[] {
  const out: Finding[] = [];
  for (const c of cycles) {
    const cv = c.charge?.cv;
    if (!c.charge || !cv || cv.ended_by !== "cut-short") continue;
    out.push({
      kind: "cv-not-terminated",
      severity: "warning",
      time_s: c.charge.end_s,
      value: cv.final_current_A,
      limit: cv.termination_current_A,
      unit: "A",
      message: `Cycle ${c.cycle}: the constant-voltage phase ended after ${cv.duration_s.toFixed(0)} s at ${cv.final_current_A.toFixed(3)} A, before the current fell to the termination value of ${(cv.termination_current_A ?? NaN).toFixed(3)} A.`,
      caution: cautions.cvOpen,
    });
  }
  return out;
}
