/**
 * Capacity fade of one cell: state of health per measurement, a least-squares fade rate per 100
 * cycles with its uncertainty, and the projected cycle and date of end of life.
 *
 * Sources: linear fade model Q = Q0 − k·n (see /work/shared/notes/domain.md, "Fade models");
 * end of life at 80 % of rated capacity by default, a setting (Diao, Saxena, Han, Pecht,
 * Energies 12 (2019) 2910, §1); regression formulas in ./line-fit.
 */
import { projectToLevel, type Crossing, type FallingTrend, type Unavailable } from "./linear-projection";
import { fitLine, type Interval } from "./line-fit";

export type { Unavailable } from "./linear-projection";

export interface CapacityPoint {
  cycle?: number;
  /** ISO 8601 date or date-time. */
  date?: string;
  capacity_mAh: number;
}

export interface FadeOptions {
  ratedCapacity_mAh: number;
  /** End-of-life state of health as a fraction of rated capacity; default 0.8. */
  eolThreshold?: number;
  /** Confidence level of the intervals; default 0.95. */
  confidence?: number;
  /** Fewest points for a trend; default (and at least) 3. */
  minPoints?: number;
}

export interface SohPoint {
  cycle: number | null;
  date: string | null;
  capacity_mAh: number;
  /** Capacity / rated capacity (1 = 100 %). */
  sohRated: number;
  /** Capacity / the cell's first measurement (1 = 100 %). */
  sohFirst: number;
}

/** A value with its standard error and a two-sided t-based confidence interval. */
export interface Estimate {
  value: number;
  standardError: number;
  low: number;
  high: number;
}

export interface EolCycle {
  ok: true;
  /** Cycle at which the fitted line reaches the end-of-life capacity. */
  cycle: number;
  /** Confidence interval of that cycle; null where the fade rate's interval includes zero. */
  interval: Interval | null;
  /** True when a measured point is already at or below the threshold. */
  reached: boolean;
}

export interface CycleFade {
  ok: true;
  n: number;
  /** Capacity lost per 100 cycles (positive = losing capacity). */
  lossPer100Cycles_mAh: Estimate;
  /** The same as a percentage of rated capacity. */
  lossPer100Cycles_pctRated: Estimate;
  intercept_mAh: number;
  residualSd_mAh: number;
  rSquared: number;
  eol: EolCycle | Unavailable;
}

export interface EolDate {
  ok: true;
  /** ISO date-time at which end of life is projected. */
  date: string;
  interval: { low: string; high: string } | null;
  /**
   * "cycle-on-date": the end-of-life cycle carried to a date by a line of cycle on date (the
   * interval maps the cycle interval through that line and ignores the line's own uncertainty);
   * "capacity-on-date": capacity fitted directly against date, when cycles are not known.
   */
  basis: "cycle-on-date" | "capacity-on-date";
  /** Cycles per day from the cycle-on-date line (cycle-on-date basis only). */
  cyclesPerDay: number | null;
  /** Capacity lost per day (capacity-on-date basis only). */
  lossPerDay_mAh: Estimate | null;
}

export interface FadeChart {
  /** "cycle": x is the cycle number; "time": x is Unix seconds (the unit uPlot's time axis uses). */
  axis: "cycle" | "time";
  measured: { x: number; capacity_mAh: number }[];
  /** The fitted line over the measured span. */
  fitted: { x: number; capacity_mAh: number }[];
  /** The fitted line carried on from the last measurement to the end-of-life crossing. */
  projection: { x: number; capacity_mAh: number }[];
  threshold_mAh: number;
}

export interface FadeAnalysis {
  ratedCapacity_mAh: number;
  eolThreshold: number;
  eolCapacity_mAh: number;
  firstCapacity_mAh: number | null;
  /** In measurement order (by cycle, or by date, or as given; see `orderPoints`). */
  points: SohPoint[];
  byCycle: CycleFade | Unavailable;
  eolDate: EolDate | Unavailable;
  chart: FadeChart | null;
}

const DAY_MS = 86_400_000;

function parseDateMs(date: string): number {
  const ms = Date.parse(date);
  if (Number.isNaN(ms)) throw new RangeError(`not an ISO date: ${date}`);
  return ms;
}

/**
 * Measurement order: by cycle when every point has one, else by date when every point has one,
 * else as given. The first point in that order is the reference for `sohFirst`.
 */
export function orderPoints(points: readonly CapacityPoint[]): CapacityPoint[] {
  const copy = [...points];
  if (copy.every((p) => p.cycle !== undefined)) return copy.sort((a, b) => (a.cycle as number) - (b.cycle as number));
  if (copy.every((p) => p.date !== undefined)) {
    return copy.sort((a, b) => parseDateMs(a.date as string) - parseDateMs(b.date as string));
  }
  return copy;
}

function validate(points: readonly CapacityPoint[], rated: number, threshold: number, confidence: number): void {
  if (!(rated > 0) || !Number.isFinite(rated)) throw new RangeError(`rated capacity must be positive, got ${rated}`);
  if (!(threshold > 0 && threshold < 1)) throw new RangeError(`end-of-life threshold must be in (0, 1), got ${threshold}`);
  if (!(confidence > 0 && confidence < 1)) throw new RangeError(`confidence must be in (0, 1), got ${confidence}`);
  for (const p of points) {
    if (!Number.isFinite(p.capacity_mAh)) throw new RangeError(`capacity must be a finite number, got ${p.capacity_mAh}`);
    if (p.cycle !== undefined && !Number.isFinite(p.cycle)) throw new RangeError(`cycle must be a finite number, got ${p.cycle}`);
  }
}

function scaled(trend: FallingTrend, factor: number, confidenceInterval: Interval): Estimate {
  // Loss is the negated slope, so the interval's ends swap.
  return {
    value: -trend.fit.slope * factor,
    standardError: trend.fit.slopeSe * factor,
    low: -confidenceInterval.high * factor,
    high: -confidenceInterval.low * factor,
  };
}

function cycleFade(ordered: readonly CapacityPoint[], options: Required<FadeOptions>, eolCapacity: number): CycleFade | Unavailable {
  const withCycle = ordered.filter((p) => p.cycle !== undefined);
  const trend = projectToLevel(
    withCycle.map((p) => p.cycle as number),
    withCycle.map((p) => p.capacity_mAh),
    eolCapacity,
    options.confidence,
    options.minPoints,
  );
  if (!trend.ok) return { ok: false, reason: `fade per cycle: ${trend.reason}` };
  const ci = trend.slopeInterval;
  const lossMah = scaled(trend, 100, ci);
  const toPct = 100 / options.ratedCapacity_mAh;
  return {
    ok: true,
    n: trend.fit.n,
    lossPer100Cycles_mAh: lossMah,
    lossPer100Cycles_pctRated: {
      value: lossMah.value * toPct,
      standardError: lossMah.standardError * toPct,
      low: lossMah.low * toPct,
      high: lossMah.high * toPct,
    },
    intercept_mAh: trend.fit.intercept,
    residualSd_mAh: trend.fit.residualSd,
    rSquared: trend.fit.rSquared,
    eol: eolFromCrossing(trend.crossing, withCycle.some((p) => p.capacity_mAh <= eolCapacity)),
  };
}

function eolFromCrossing(crossing: Crossing | Unavailable, reached: boolean): EolCycle | Unavailable {
  if (!crossing.ok) return { ok: false, reason: `end-of-life cycle: ${crossing.reason}` };
  return { ok: true, cycle: crossing.x, interval: crossing.interval, reached };
}

function isoFromMs(ms: number): string | null {
  // Date supports ±8.64e15 ms; a projection beyond that is not a date.
  return Number.isFinite(ms) && Math.abs(ms) <= 8.64e15 ? new Date(ms).toISOString() : null;
}

/** Carries a projected position and its interval to calendar dates. */
function datedEol(
  toIso: (x: number) => string | null,
  x: number,
  interval: Interval | null,
  basis: Pick<EolDate, "basis" | "cyclesPerDay" | "lossPerDay_mAh">,
): EolDate | Unavailable {
  const date = toIso(x);
  if (!date) return { ok: false, reason: "end-of-life date: projection lies outside the calendar" };
  const low = interval ? toIso(interval.low) : null;
  const high = interval ? toIso(interval.high) : null;
  return { ok: true, date, interval: low && high ? { low, high } : null, ...basis };
}

function eolDateFromCycles(ordered: readonly CapacityPoint[], eol: EolCycle, minPoints: number): EolDate | Unavailable {
  const both = ordered.filter((p) => p.cycle !== undefined && p.date !== undefined);
  if (both.length < Math.max(minPoints, 3)) {
    return { ok: false, reason: `end-of-life date: needs at least ${Math.max(minPoints, 3)} points with both cycle and date, has ${both.length}` };
  }
  const origin = parseDateMs(both[0]?.date as string);
  const days = both.map((p) => (parseDateMs(p.date as string) - origin) / DAY_MS);
  const cycles = both.map((p) => p.cycle as number);
  // Cycle on date: the rate at which this cell is being cycled, projected forward.
  const line = fitLine(days, cycles);
  if (!line) return { ok: false, reason: "end-of-life date: all measurements share one date" };
  const perDay = line.slope;
  if (!(perDay > 0)) return { ok: false, reason: "end-of-life date: cycle count is not advancing with date" };
  const toIso = (cycle: number): string | null => isoFromMs(origin + ((cycle - line.intercept) / perDay) * DAY_MS);
  return datedEol(toIso, eol.cycle, eol.interval, { basis: "cycle-on-date", cyclesPerDay: perDay, lossPerDay_mAh: null });
}

function eolDateFromCapacity(ordered: readonly CapacityPoint[], options: Required<FadeOptions>, eolCapacity: number): EolDate | Unavailable {
  const dated = ordered.filter((p) => p.date !== undefined);
  if (dated.length === 0) return { ok: false, reason: "end-of-life date: no measurement has a date" };
  const origin = parseDateMs(dated[0]?.date as string);
  const days = dated.map((p) => (parseDateMs(p.date as string) - origin) / DAY_MS);
  const trend = projectToLevel(days, dated.map((p) => p.capacity_mAh), eolCapacity, options.confidence, options.minPoints);
  if (!trend.ok) return { ok: false, reason: `end-of-life date: ${trend.reason}` };
  if (!trend.crossing.ok) return { ok: false, reason: `end-of-life date: ${trend.crossing.reason}` };
  const toIso = (day: number): string | null => isoFromMs(origin + day * DAY_MS);
  return datedEol(toIso, trend.crossing.x, trend.crossing.interval, {
    basis: "capacity-on-date",
    cyclesPerDay: null,
    lossPerDay_mAh: scaled(trend, 1, trend.slopeInterval),
  });
}

function chartFor(ordered: readonly CapacityPoint[], byCycle: CycleFade | Unavailable, eolCapacity: number): FadeChart | null {
  if (!byCycle.ok) return null;
  const measured = ordered
    .filter((p) => p.cycle !== undefined)
    .map((p) => ({ x: p.cycle as number, capacity_mAh: p.capacity_mAh }));
  const slope = -byCycle.lossPer100Cycles_mAh.value / 100;
  const at = (x: number) => ({ x, capacity_mAh: byCycle.intercept_mAh + slope * x });
  const xs = measured.map((m) => m.x);
  const first = Math.min(...xs);
  const last = Math.max(...xs);
  const projection =
    byCycle.eol.ok && byCycle.eol.cycle > last ? [at(last), at(byCycle.eol.cycle)] : [];
  return { axis: "cycle", measured, fitted: [at(first), at(last)], projection, threshold_mAh: eolCapacity };
}

function dateChart(ordered: readonly CapacityPoint[], eolDate: EolDate | Unavailable, eolCapacity: number): FadeChart | null {
  if (!eolDate.ok || eolDate.basis !== "capacity-on-date" || !eolDate.lossPerDay_mAh) return null;
  const dated = ordered.filter((p) => p.date !== undefined);
  const seconds = dated.map((p) => parseDateMs(p.date as string) / 1000);
  const caps = dated.map((p) => p.capacity_mAh);
  const origin = seconds[0] as number;
  const eolSeconds = Date.parse(eolDate.date) / 1000;
  // The line passes through the end-of-life point with the fitted slope per day.
  const perSecond = -eolDate.lossPerDay_mAh.value / 86_400;
  const at = (x: number) => ({ x, capacity_mAh: eolCapacity + perSecond * (x - eolSeconds) });
  const last = Math.max(...seconds);
  return {
    axis: "time",
    measured: seconds.map((x, i) => ({ x, capacity_mAh: caps[i] as number })),
    fitted: [at(origin), at(last)],
    projection: eolSeconds > last ? [at(last), at(eolSeconds)] : [],
    threshold_mAh: eolCapacity,
  };
}

/**
 * Fade analysis of one cell. Any part that cannot be computed (too few points, capacity not
 * falling, no dates) comes back as `{ ok: false, reason }`; the rest is still filled in.
 */
export function analyzeFade(points: readonly CapacityPoint[], options: FadeOptions): FadeAnalysis {
  const full: Required<FadeOptions> = {
    ratedCapacity_mAh: options.ratedCapacity_mAh,
    eolThreshold: options.eolThreshold ?? 0.8,
    confidence: options.confidence ?? 0.95,
    minPoints: options.minPoints ?? 3,
  };
  validate(points, full.ratedCapacity_mAh, full.eolThreshold, full.confidence);
  const ordered = orderPoints(points);
  const eolCapacity = full.eolThreshold * full.ratedCapacity_mAh;
  const first = ordered[0]?.capacity_mAh ?? null;
  const sohPoints = ordered.map((p) => ({
    cycle: p.cycle ?? null,
    date: p.date ?? null,
    capacity_mAh: p.capacity_mAh,
    sohRated: p.capacity_mAh / full.ratedCapacity_mAh,
    sohFirst: first && first > 0 ? p.capacity_mAh / first : NaN,
  }));
  const byCycle = cycleFade(ordered, full, eolCapacity);
  let eolDate: EolDate | Unavailable;
  if (byCycle.ok) {
    eolDate = byCycle.eol.ok
      ? eolDateFromCycles(ordered, byCycle.eol, full.minPoints)
      : { ok: false, reason: `end-of-life date: ${byCycle.eol.reason}` };
  } else {
    eolDate = eolDateFromCapacity(ordered, full, eolCapacity);
  }
  return {
    ratedCapacity_mAh: full.ratedCapacity_mAh,
    eolThreshold: full.eolThreshold,
    eolCapacity_mAh: eolCapacity,
    firstCapacity_mAh: first,
    points: sohPoints,
    byCycle,
    eolDate,
    chart: chartFor(ordered, byCycle, eolCapacity) ?? dateChart(ordered, eolDate, eolCapacity),
  };
}
