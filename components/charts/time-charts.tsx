"use client";

import { useMemo } from "react";
import { alignTraces } from "@/lib/charts/align";
import type { PlotView, XY } from "@/lib/charts/plot-series";
import { bandAlpha, groupToken, hatchedKinds, legendKinds, stepBands } from "@/lib/charts/step-bands";
import { quantities, timeScaleFor, type TimeScale } from "@/lib/charts/units";
import { formatClock, formatVolts } from "@/lib/notebook/format";
import { drawMarkers, drawShades, type Marker, type Shade } from "./draw";
import { StepLegend } from "./step-legend";
import { UplotChart, type ChartAxis, type ChartSeries, type ChartX, type ColorOf } from "./uplot-chart";
import type uPlot from "uplot";

const inUnit = (trace: XY, scale: TimeScale) => ({ x: trace.x.map((s) => (s === null ? Number.NaN : s / scale.secondsPer)), y: trace.y });

function useStepShading(plot: Pick<PlotView, "stepEdges" | "switchPoints">, durationS: number, scale: TimeScale) {
  return useMemo(() => {
    const bands = stepBands(plot.stepEdges, durationS);
    const shades: Shade[] = bands.map((b) => ({ from: b.from / scale.secondsPer, to: b.to / scale.secondsPer, token: groupToken[b.group], alpha: bandAlpha[b.kind], hatch: hatchedKinds.has(b.kind) }));
    const markers: Marker[] = plot.switchPoints.map((p) => ({ x: p.time_s / scale.secondsPer, y: p.voltage_V, label: "CC→CV" }));
    return { bands, shades, markers, kinds: legendKinds(bands) };
  }, [plot.stepEdges, plot.switchPoints, durationS, scale]);
}

/**
 * Voltage (left axis) and current (right axis) against time, the steps shaded by kind and each
 * CC→CV switch marked where the voltage reached its limit.
 */
export function VoltageCurrentChart({ plot, durationS }: { plot: Pick<PlotView, "voltage" | "current" | "stepEdges" | "switchPoints">; durationS: number }) {
  const scale = useMemo(() => timeScaleFor(durationS), [durationS]);
  const shading = useStepShading(plot, durationS, scale);
  const { voltage, current } = plot;
  const model = useMemo(() => {
    const traces = [voltage, current].map((t) => (t ? inUnit(t, scale) : { x: [], y: [] }));
    const aligned = alignTraces(traces);
    const x: ChartX = { quantity: scale.quantity };
    const yAxes: ChartAxis[] = [
      { scale: "V", quantity: quantities.voltage },
      { scale: "A", quantity: quantities.current },
    ];
    const series: ChartSeries[] = [
      { label: "Voltage", quantity: quantities.voltage, color: "ink", scale: "V", width: 2 },
      { label: "Current", quantity: quantities.current, color: "copper", scale: "A", dash: [7, 4] },
    ];
    return { data: [aligned.x, ...aligned.ys], x, yAxes, series };
  }, [voltage, current, scale]);
  const under = useMemo(() => (u: uPlot, color: ColorOf) => drawShades(u, shading.shades, color), [shading]);
  const over = useMemo(() => (u: uPlot, color: ColorOf) => drawMarkers(u, shading.markers, "V", "copper-dark", color), [shading]);
  const switchText = plot.switchPoints.length
    ? ` CC→CV switch at ${plot.switchPoints.map((p) => `${formatClock(p.time_s)} (${formatVolts(p.voltage_V)})`).join(", ")}.`
    : " No CC→CV switch in this log.";
  return (
    <UplotChart
      title="Voltage and current against time"
      summary={`Voltage and current over ${formatClock(durationS)} (h:mm:ss) in ${shading.bands.length} steps.${switchText}`}
      {...model}
      height={320}
      under={under}
      over={over}
      legendExtra={<StepLegend kinds={shading.kinds} withSwitch={shading.markers.length > 0} />}
    />
  );
}

/** Cell temperature against time, shaded by step like the voltage chart so heating lines up with the step that caused it. */
export function TemperatureChart({ plot, durationS }: { plot: Pick<PlotView, "temperature" | "stepEdges" | "switchPoints">; durationS: number }) {
  const scale = useMemo(() => timeScaleFor(durationS), [durationS]);
  const shading = useStepShading(plot, durationS, scale);
  const model = useMemo(() => {
    const aligned = alignTraces(plot.temperature ? [inUnit(plot.temperature, scale)] : []);
    const series: ChartSeries[] = [{ label: "Temperature", quantity: quantities.temperature, color: "danger", scale: "C", width: 2 }];
    const yAxes: ChartAxis[] = [{ scale: "C", quantity: quantities.temperature }];
    return { data: [aligned.x, ...aligned.ys], x: { quantity: scale.quantity } as ChartX, yAxes, series };
  }, [plot.temperature, scale]);
  const under = useMemo(() => (u: uPlot, color: ColorOf) => drawShades(u, shading.shades, color), [shading]);
  const values = (plot.temperature?.y ?? []).filter((v): v is number => v !== null);
  const range = values.length ? `from ${Math.min(...values).toFixed(1)} to ${Math.max(...values).toFixed(1)} °C` : "";
  return (
    <UplotChart
      title="Temperature against time"
      summary={`Cell temperature over ${formatClock(durationS)} (h:mm:ss), ${range}.`}
      {...model}
      height={220}
      under={under}
      legendExtra={<StepLegend kinds={shading.kinds} withSwitch={false} />}
    />
  );
}
