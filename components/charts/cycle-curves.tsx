"use client";

import { useId, useMemo, useState } from "react";
import type uPlot from "uplot";
import { dashes } from "@/lib/charts/colors";
import { chargeCurve, curveCycles, dischargeCurve, icaCurvesOfCycle, overlay } from "@/lib/charts/curves";
import type { CapacityCurve, IcaCurve } from "@/lib/charts/plot-series";
import { quantities } from "@/lib/charts/units";
import { formatMah, formatVolts } from "@/lib/notebook/format";
import { inputClass } from "@/components/ui/field";
import { drawMarkers } from "./draw";
import { UplotChart, type ChartAxis, type ChartSeries, type ColorOf } from "./uplot-chart";

const voltageAxis: ChartAxis[] = [{ scale: "V", quantity: quantities.voltage }];
const icaAxis: ChartAxis[] = [{ scale: "dQdV", quantity: quantities.incrementalCapacity }];

/**
 * Voltage against capacity (the cycle's charge, CC and CV joined, and its discharge) and dQ/dV of
 * its constant-current steps, for one cycle at a time; a picker when the log holds several.
 */
export function CycleCurves({ capacityCurves, icaCurves, initialCycle }: { capacityCurves: CapacityCurve[]; icaCurves: IcaCurve[]; initialCycle: number | null }) {
  const cycles = useMemo(() => curveCycles([...capacityCurves, ...icaCurves]), [capacityCurves, icaCurves]);
  const [cycle, setCycle] = useState<number | null>(initialCycle !== null && cycles.includes(initialCycle) ? initialCycle : (cycles[cycles.length - 1] ?? null));
  const pickerId = useId();

  const vq = useMemo(() => {
    if (cycle === null) return null;
    const charge = chargeCurve(capacityCurves, cycle);
    const discharge = dischargeCurve(capacityCurves, cycle);
    const traces = [
      ...(charge ? [{ label: "Charge", x: charge.capacity_mAh, y: charge.voltage_V }] : []),
      ...(discharge ? [{ label: "Discharge", x: discharge.capacity_mAh, y: discharge.voltage_V }] : []),
    ];
    if (traces.length === 0) return null;
    const o = overlay(traces);
    const series: ChartSeries[] = o.labels.map((label) =>
      label === "Charge"
        ? { label, quantity: quantities.voltage, color: "charge", scale: "V", width: 2 }
        : { label, quantity: quantities.voltage, color: "discharge", scale: "V", width: 2, dash: dashes[1] },
    );
    const markers = charge?.switchAt ? [{ x: charge.switchAt.capacity_mAh, y: charge.switchAt.voltage_V, label: "CC→CV" }] : [];
    const summary = [
      charge ? `Charge to ${formatMah(charge.capacity_mAh.at(-1))}${charge.switchAt ? `, switching to constant voltage at ${formatMah(charge.switchAt.capacity_mAh)} and ${formatVolts(charge.switchAt.voltage_V)}` : ""}.` : "",
      discharge ? `Discharge delivering ${formatMah(discharge.capacity_mAh.at(-1))}, from ${formatVolts(discharge.voltage_V[0])} to ${formatVolts(discharge.voltage_V.at(-1))}.` : "",
    ].join(" ");
    return { data: [o.x, ...o.ys], series, markers, summary };
  }, [capacityCurves, cycle]);

  const ica = useMemo(() => {
    if (cycle === null) return null;
    const traces = icaCurvesOfCycle(icaCurves, cycle).filter((t) => t.x.length > 2);
    if (traces.length === 0) return null;
    const o = overlay(traces);
    let charges = 0;
    let discharges = 0;
    const series: ChartSeries[] = o.labels.map((label) => {
      const isCharge = label.startsWith("Charge");
      const n = isCharge ? charges++ : discharges++;
      return { label, quantity: quantities.incrementalCapacity, color: isCharge ? "charge" : "discharge", scale: "dQdV", width: 1.75, dash: dashes[(isCharge ? 0 : 1) + 2 * n] };
    });
    return { data: [o.x, ...o.ys], series };
  }, [icaCurves, cycle]);

  const markers = vq?.markers;
  const over = useMemo(() => (markers?.length ? (u: uPlot, color: ColorOf) => drawMarkers(u, markers, "V", "copper-dark", color) : undefined), [markers]);

  if (cycles.length === 0 || cycle === null)
    return <p className="text-sm text-ink-soft">This log has no constant-current or constant-voltage steps, so there are no capacity curves to draw.</p>;

  return (
    <div className="space-y-6">
      {cycles.length > 1 ? (
        <div className="no-print flex items-center gap-2 text-sm">
          <label htmlFor={pickerId} className="font-medium">
            Cycle
          </label>
          <select id={pickerId} value={cycle} onChange={(e) => setCycle(Number(e.target.value))} className={`${inputClass} w-auto!`}>
            {cycles.map((c) => (
              <option key={c} value={c}>
                Cycle {c}
              </option>
            ))}
          </select>
          <span className="text-ink-soft">of {cycles.length} with curves</span>
        </div>
      ) : null}
      <div className="grid gap-6 xl:grid-cols-2">
        {vq ? (
          <UplotChart
            key={`vq-${cycle}`}
            title={`Voltage against capacity, cycle ${cycle}`}
            summary={vq.summary}
            x={{ quantity: quantities.capacity }}
            yAxes={voltageAxis}
            series={vq.series}
            data={vq.data}
            over={over}
            height={280}
          />
        ) : (
          <p className="text-sm text-ink-soft">Cycle {cycle} has no charge or discharge curve.</p>
        )}
        {ica ? (
          <UplotChart
            key={`ica-${cycle}`}
            title={`Incremental capacity dQ/dV, cycle ${cycle}`}
            summary="dQ/dV of the constant-current steps only, on a uniform voltage grid and smoothed, as recommended for incremental capacity analysis (Dubarry & Anseán, Front. Energy Res. 10 (2022) 1023555). Peaks depend on the C-rate, given with each curve."
            x={{ quantity: quantities.voltage }}
            yAxes={icaAxis}
            series={ica.series}
            data={ica.data}
            height={280}
          />
        ) : (
          <p className="text-sm text-ink-soft">Cycle {cycle} has no constant-current step long enough for dQ/dV.</p>
        )}
      </div>
    </div>
  );
}
