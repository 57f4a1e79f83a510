"use client";

import { useMemo } from "react";
import type uPlot from "uplot";
import { drawMarkers, type Marker } from "@/components/charts/draw";
import { UplotChart, type ChartSeries, type ColorOf } from "@/components/charts/uplot-chart";
import { alignTraces } from "@/lib/charts/align";
import { quantities } from "@/lib/charts/units";
import type { FadeChart as FadeChartData } from "@/lib/stats";

interface Props {
  chart: FadeChartData;
  eolThresholdPct: number;
  /** The knee (Bacon–Watts x1) when significant, on the cycle axis. */
  knee: { x: number; y: number } | null;
  summary: string;
}

const xy = (points: readonly { x: number; capacity_mAh: number }[]) => ({ x: points.map((p) => p.x), y: points.map((p) => p.capacity_mAh) });

/** Capacity against cycle (or date): measurements, the least-squares line, its projection to end of life and the threshold. */
export function FadeChart({ chart, eolThresholdPct, knee, summary }: Props) {
  const model = useMemo(() => {
    const measured = xy(chart.measured);
    const fitted = xy(chart.fitted);
    const projection = xy(chart.projection);
    const xs = [...measured.x, ...fitted.x, ...projection.x];
    const span = { x: [Math.min(...xs), Math.max(...xs)], y: [chart.threshold_mAh, chart.threshold_mAh] };
    const aligned = alignTraces([measured, fitted, projection, span]);
    const series: ChartSeries[] = [
      { label: "Measured", quantity: quantities.capacity, color: "discharge", kind: "points", scale: "mAh" },
      { label: "Least-squares line", quantity: quantities.capacity, color: "ink", width: 1.5, scale: "mAh" },
      { label: "Projection to end of life", quantity: quantities.capacity, color: "copper", dash: [8, 5], width: 2, scale: "mAh" },
      { label: `End of life (${eolThresholdPct} % of rated)`, quantity: quantities.capacity, color: "danger", dash: [3, 4], width: 1.5, scale: "mAh" },
    ];
    return { data: [aligned.x, ...aligned.ys], series };
  }, [chart, eolThresholdPct]);
  const markers = useMemo<Marker[]>(() => (knee ? [{ x: knee.x, y: knee.y, label: `knee at cycle ${Math.round(knee.x)}` }] : []), [knee]);
  const over = useMemo(() => (markers.length ? (u: uPlot, color: ColorOf) => drawMarkers(u, markers, "mAh", "warn", color) : undefined), [markers]);
  const x = useMemo(
    () => (chart.axis === "time" ? { quantity: { label: "Date", unit: "date", decimals: 0 }, time: true } : { quantity: quantities.cycle }),
    [chart.axis],
  );
  const yAxes = useMemo(() => [{ scale: "mAh", quantity: quantities.capacity }], []);
  return <UplotChart title="Capacity fade and projection" summary={summary} x={x} yAxes={yAxes} series={model.series} data={model.data} over={over} height={320} />;
}
