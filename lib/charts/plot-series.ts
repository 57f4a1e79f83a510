/**
 * The stored plot series of one analysis (lib/analysis/plot.ts, one database row per trace),
 * read back loosely: JSON turned non-finite numbers into null, and a trace the engine did not
 * write (no temperature column) is simply absent. Anything not in the expected shape is left out
 * rather than failing the page.
 */
import { z } from "zod";
import { stepKinds } from "@/lib/analysis/types";

const numbers = z.array(z.number().nullable());
const xy = z.object({ x: numbers, y: numbers });
const kind = z.enum(stepKinds);

const edges = z.array(z.object({ time_s: z.number(), step: z.number().int(), kind }));
const switches = z.array(z.object({ time_s: z.number(), voltage_V: z.number().nullable(), cycle: z.number().int() }));
const capacityCurves = z.array(
  z.object({ step: z.number().int(), cycle: z.number().int(), kind, capacity_mAh: numbers, voltage_V: numbers }),
);
const icaCurves = z.array(
  z.object({
    step: z.number().int(),
    cycle: z.number().int(),
    kind,
    c_rate: z.number().nullable(),
    voltage_V: numbers,
    dQdV_mAh_per_V: numbers,
  }),
);

export type XY = z.output<typeof xy>;
export type StepEdge = z.output<typeof edges>[number];
export type SwitchPoint = z.output<typeof switches>[number];
export type CapacityCurve = z.output<typeof capacityCurves>[number];
export type IcaCurve = z.output<typeof icaCurves>[number];

export interface PlotView {
  voltage: XY | null;
  current: XY | null;
  temperature: XY | null;
  stepEdges: StepEdge[];
  switchPoints: SwitchPoint[];
  capacityCurves: CapacityCurve[];
  incrementalCapacity: IcaCurve[];
}

function read<T>(schema: z.ZodType<T>, value: unknown, fallback: T): T {
  const parsed = schema.safeParse(value);
  return parsed.success ? parsed.data : fallback;
}

/** Trace name → stored data, as `getRunDetail` returns it, into what the charts draw. */
export function plotView(series: Record<string, unknown>): PlotView {
  return {
    voltage: read(xy.nullable(), series.voltage ?? null, null),
    current: read(xy.nullable(), series.current ?? null, null),
    temperature: read(xy.nullable(), series.temperature ?? null, null),
    stepEdges: read(edges, series.step_edges, []),
    switchPoints: read(switches, series.switch_points, []),
    capacityCurves: read(capacityCurves, series.capacity_curves, []),
    incrementalCapacity: read(icaCurves, series.incremental_capacity, []),
  };
}

/** Only the voltage trace (for sparklines): the cheapest part of a series to send. */
export function voltageTraceOf(data: unknown): XY | null {
  return read(xy.nullable(), data ?? null, null);
}

export function capacityCurvesOf(data: unknown): CapacityCurve[] {
  return read(capacityCurves, data, []);
}
