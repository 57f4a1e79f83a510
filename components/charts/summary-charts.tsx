"use client";

import { useMemo } from "react";
import type uPlot from "uplot";
import { capacityByCycleOfRuns, type CycleCapacity } from "@/lib/charts/capacity";
import { overlayStyle } from "@/lib/charts/colors";
import { overlay } from "@/lib/charts/curves";
import type { HistogramBars } from "@/lib/charts/histogram-bars";
import { quantities } from "@/lib/charts/units";
import { formatMah } from "@/lib/notebook/format";
import { drawMarkers, type Marker } from "./draw";
import { UplotChart, type ChartAxis, type ChartSeries, type ColorOf } from "./uplot-chart";

const voltageAxis: ChartAxis[] = [{ scale: "V", quantity: quantities.voltage }];
const capacityAxis: ChartAxis[] = [{ scale: "mAh", quantity: quantities.capacity }];

export interface LabelledCurve {
  key: string;
  label: string;
  capacity_mAh: number[];
  voltage_V: number[];
}

/** Several discharge curves (voltage against delivered mAh) on one chart, colour and dash changing together. */
export function DischargeOverlayChart({ curves, title }: { curves: LabelledCurve[]; title: string }) {
  const model = useMemo(() => {
    const o = overlay(curves.map((c) => ({ label: c.label, x: c.capacity_mAh, y: c.voltage_V })));
    const series: ChartSeries[] = o.labels.map((label, i) => {
      const style = overlayStyle(i);
      return { label, quantity: quantities.voltage, color: style.token, dash: style.dash, scale: "V", width: 2 };
    });
    return { data: [o.x, ...o.ys], series };
  }, [curves]);
  const reach = curves.map((c) => `${c.label} ${formatMah(c.capacity_mAh.at(-1))}`).join("; ");
  return (
    <UplotChart
      title={title}
      summary={`Voltage against delivered capacity for ${curves.length} discharge${curves.length === 1 ? "" : "s"}: ${reach}.`}
      x={{ quantity: quantities.capacity }}
      yAxes={voltageAxis}
      series={model.series}
      data={model.data}
      height={300}
    />
  );
}

/** Horizontal reference line (rated capacity) across the plot. */
function drawRated(u: uPlot, ratedMah: number, color: ColorOf): void {
  const y = u.valToPos(ratedMah, "mAh", true);
  const { ctx, bbox } = u;
  if (!(y >= bbox.top && y <= bbox.top + bbox.height)) return;
  const dpr = typeof devicePixelRatio === "number" ? devicePixelRatio : 1;
  ctx.save();
  ctx.strokeStyle = color("ink-soft");
  ctx.fillStyle = color("ink-soft");
  ctx.lineWidth = dpr;
  ctx.setLineDash([6 * dpr, 4 * dpr]);
  ctx.beginPath();
  ctx.moveTo(bbox.left, y);
  ctx.lineTo(bbox.left + bbox.width, y);
  ctx.stroke();
  ctx.font = `${11 * dpr}px ${getComputedStyle(document.body).fontFamily}`;
  const text = `rated ${ratedMah} mAh`;
  ctx.fillText(text, bbox.left + bbox.width - ctx.measureText(text).width - 4 * dpr, y - 4 * dpr);
  ctx.restore();
}

/** Delivered capacity of each run against the day it was uploaded, with the rated capacity as a reference line. */
export function CapacityByDateChart({ x, y, ratedMah }: { x: number[]; y: number[]; ratedMah: number | null }) {
  const data = useMemo(() => [x, y], [x, y]);
  const series = useMemo<ChartSeries[]>(() => [{ label: "Delivered capacity", quantity: quantities.capacity, color: "discharge", scale: "mAh", kind: "line-points", width: 1.5 }], []);
  const over = useMemo(() => (ratedMah ? (u: uPlot, color: ColorOf) => drawRated(u, ratedMah, color) : undefined), [ratedMah]);
  const yAxes = useMemo<ChartAxis[]>(() => {
    const values = ratedMah ? [...y, ratedMah] : y;
    const lo = Math.min(...values);
    const hi = Math.max(...values);
    const pad = Math.max(1, (hi - lo) * 0.15);
    return [{ scale: "mAh", quantity: quantities.capacity, range: { min: lo - pad, max: hi + pad } }];
  }, [y, ratedMah]);
  // At least two days either side of the runs, so one run (or runs minutes apart) sits inside a readable date axis.
  const xAxis = useMemo(() => {
    const day = 86_400;
    const lo = Math.min(...x);
    const hi = Math.max(...x);
    const pad = Math.max(2 * day, (hi - lo) * 0.05);
    return { quantity: { label: "Test ended", unit: "date", decimals: 0 }, time: true, range: { min: lo - pad, max: hi + pad } };
  }, [x]);
  return (
    <UplotChart
      title="Delivered capacity per run, by date"
      summary={`Delivered capacity of ${y.length} run${y.length === 1 ? "" : "s"} over time${ratedMah ? `, against the rated ${ratedMah} mAh` : ""}.`}
      x={xAxis}
      yAxes={yAxes}
      series={series}
      data={data}
      over={over}
      height={240}
    />
  );
}

/** Delivered capacity per full cycle, one line per multi-cycle run. */
export function CapacityByCycleChart({ runs }: { runs: { label: string; cycles: CycleCapacity[] }[] }) {
  const model = useMemo(() => {
    const o = capacityByCycleOfRuns(runs);
    const series: ChartSeries[] = o.labels.map((label, i) => {
      const style = overlayStyle(i);
      return { label, quantity: quantities.capacity, color: style.token, dash: style.dash, scale: "mAh", kind: "line-points" };
    });
    return { data: [o.x, ...o.ys], series };
  }, [runs]);
  const x = useMemo(() => ({ quantity: quantities.cycle }), []);
  return (
    <UplotChart
      title="Delivered capacity per cycle"
      summary={`Discharge capacity of each full cycle (a charge, then a discharge) in ${runs.length} run${runs.length === 1 ? "" : "s"}.`}
      x={x}
      yAxes={capacityAxis}
      series={model.series}
      data={model.data}
      height={240}
    />
  );
}

/** Cells per capacity bin, with the batch's lower and upper spec limits drawn in. */
export function CapacityHistogramChart({ bars }: { bars: HistogramBars }) {
  const data = useMemo(() => [bars.x, bars.counts], [bars]);
  const series = useMemo<ChartSeries[]>(() => [{ label: "Cells", quantity: quantities.count, color: "discharge", scale: "n", kind: "bars" }], []);
  const yAxes = useMemo<ChartAxis[]>(() => [{ scale: "n", quantity: quantities.count, range: { min: 0, max: Math.max(1, ...bars.counts) + 1 } }], [bars]);
  const x = useMemo(() => ({ quantity: { label: "Delivered capacity", unit: "mAh", decimals: 1 }, range: bars.range }), [bars]);
  const markers = useMemo<Marker[]>(
    () => [...(bars.lsl !== null ? [{ x: bars.lsl, label: `lower limit ${bars.lsl} mAh` }] : []), ...(bars.usl !== null ? [{ x: bars.usl, label: `upper limit ${bars.usl} mAh` }] : [])],
    [bars],
  );
  const over = useMemo(() => (u: uPlot, color: ColorOf) => drawMarkers(u, markers, "n", "danger", color), [markers]);
  const n = bars.counts.reduce((a, b) => a + b, 0);
  return (
    <UplotChart
      title="Latest delivered capacity of the batch's cells"
      summary={`${n} cell${n === 1 ? "" : "s"} in bins of ${bars.binWidth.toFixed(1)} mAh${bars.lsl !== null ? `; lower spec limit ${bars.lsl} mAh` : ""}${bars.usl !== null ? `, upper ${bars.usl} mAh` : ""}.`}
      x={x}
      yAxes={yAxes}
      series={series}
      data={data}
      over={over}
      height={240}
    />
  );
}
