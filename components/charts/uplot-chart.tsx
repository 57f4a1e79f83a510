"use client";

import { useEffect, useId, useMemo, useRef, useState, type KeyboardEvent, type ReactNode } from "react";
import uPlot from "uplot";
import "uplot/dist/uPlot.min.css";
import { nearestValue } from "@/lib/charts/align";
import { withAlpha, type ColorToken } from "@/lib/charts/colors";
import { axisLabel, readout, type Quantity } from "@/lib/charts/units";

export interface ChartSeries {
  label: string;
  quantity: Quantity;
  color: ColorToken;
  /** Dash pattern in CSS pixels; solid when absent. */
  dash?: number[];
  width?: number;
  /** Which y axis (scale key of `yAxes`); the first axis when absent. */
  scale?: string;
  kind?: "line" | "points" | "line-points" | "bars";
  /** Hidden at first (the legend can show it). */
  hidden?: boolean;
}

export interface ChartAxis {
  scale: string;
  quantity: Quantity;
  /** A fixed range (a histogram's counts start at 0). */
  range?: { min: number; max: number };
}

export interface ChartX {
  quantity: Quantity;
  /** UNIX seconds, drawn as dates. */
  time?: boolean;
  range?: { min: number; max: number };
}

/** Colours resolved from the palette, for drawing hooks. */
export type ColorOf = (token: ColorToken, alpha?: number) => string;

export interface UplotChartProps {
  /** The chart's name, shown above it. */
  title: string;
  /** What the chart shows, in a sentence or two: the text alternative for screen readers and a caption in print. */
  summary: string;
  x: ChartX;
  yAxes: ChartAxis[];
  series: ChartSeries[];
  /** [x, y1, y2, …]: one shared ascending x array (lib/charts/align.ts). */
  data: (number | null)[][];
  height?: number;
  /** Drawn under the series (shading). */
  under?: (u: uPlot, color: ColorOf) => void;
  /** Drawn over the series (markers). */
  over?: (u: uPlot, color: ColorOf) => void;
  /** Extra legend content, e.g. what the shading means. */
  legendExtra?: ReactNode;
  /** A small chart: no zoom, no legend toggles. */
  compact?: boolean;
}

const printWidth = 680;

function cssToken(token: ColorToken): string {
  return getComputedStyle(document.documentElement).getPropertyValue(`--color-${token}`).trim() || "#1f2530";
}

const colorOf: ColorOf = (token, alpha = 1) => (alpha >= 1 ? cssToken(token) : withAlpha(cssToken(token), alpha));

function finiteExtent(xs: readonly (number | null)[]): { min: number; max: number } | null {
  let min = Infinity;
  let max = -Infinity;
  for (const v of xs) {
    if (v === null || !Number.isFinite(v)) continue;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  return min <= max ? { min, max } : null;
}

function formatX(x: ChartX, value: number): string {
  if (x.time) return new Date(value * 1000).toISOString().slice(0, 10);
  return readout(value, x.quantity);
}

interface Readout {
  x: string;
  values: (string | null)[];
}

/**
 * The one uPlot wrapper: resizes with its box (and to a page width in print), labels every axis
 * with its unit, shows a read-out with units under the cursor, toggles traces from its legend,
 * zooms by dragging (with a reset), and works from the keyboard: focus the chart, then ← → move
 * the read-out, + and − zoom around it, Escape resets.
 */
export function UplotChart({ title, summary, x, yAxes, series, data, height = 300, under, over, legendExtra, compact = false }: UplotChartProps) {
  const box = useRef<HTMLDivElement>(null);
  const plot = useRef<uPlot | null>(null);
  const [shown, setShown] = useState(() => series.map((s) => !s.hidden));
  const [zoomed, setZoomed] = useState(false);
  const [reading, setReading] = useState<Readout | null>(null);
  const [keyboard, setKeyboard] = useState(false);
  const id = useId();
  const full = useMemo(() => x.range ?? finiteExtent(data[0] ?? []), [data, x.range]);
  // The chart is rebuilt when its data changes; it keeps the legend's choices through this ref.
  const shownRef = useRef(shown);
  useEffect(() => {
    shownRef.current = shown;
  }, [shown]);

  useEffect(() => {
    const el = box.current;
    if (!el) return;
    const ink = colorOf("ink");
    const grid = colorOf("rule");
    const font = `12px ${getComputedStyle(document.body).fontFamily}`;
    const labelFont = `600 12px ${getComputedStyle(document.body).fontFamily}`;
    const axisBase = { stroke: ink, font, labelFont, grid: { stroke: grid, width: 1 }, ticks: { stroke: grid, width: 1 } };
    const opts: uPlot.Options = {
      width: Math.max(200, el.clientWidth),
      height,
      legend: { show: false },
      cursor: {
        drag: compact ? { x: false, y: false } : { x: true, y: false, setScale: true },
        // Aligned data has nulls where a trace has no sample: read each trace at its nearest sample.
        dataIdx: (u, seriesIdx, closestIdx) => nearestValue(u.data[seriesIdx] as (number | null)[], closestIdx)?.index ?? closestIdx,
        points: { size: 7, width: 2 },
      },
      scales: {
        x: { time: Boolean(x.time), ...(x.range ? { range: [x.range.min, x.range.max] as uPlot.Range.MinMax } : {}) },
        ...Object.fromEntries(yAxes.map((a) => [a.scale, a.range ? { range: [a.range.min, a.range.max] as uPlot.Range.MinMax } : { auto: true }])),
      },
      axes: [
        { ...axisBase, label: axisLabel(x.quantity), labelSize: 22 },
        ...yAxes.map((a, i) => ({
          ...axisBase,
          scale: a.scale,
          label: axisLabel(a.quantity),
          labelSize: 22,
          side: i === 0 ? 3 : 1,
          size: 56,
          grid: i === 0 ? axisBase.grid : { show: false },
        })),
      ],
      series: [
        { label: axisLabel(x.quantity) },
        ...series.map((s, i): uPlot.Series => {
          const stroke = colorOf(s.color);
          const kind = s.kind ?? "line";
          const base: uPlot.Series = {
            label: s.label,
            scale: s.scale ?? yAxes[0]?.scale ?? "y",
            stroke,
            width: s.width ?? 1.75,
            dash: s.dash,
            spanGaps: true,
            show: shownRef.current[i] ?? true,
            points: { show: kind === "points" || kind === "line-points", size: 6, stroke, fill: colorOf("sheet") },
          };
          if (kind === "points") return { ...base, paths: () => null };
          if (kind === "bars") {
            const bars = uPlot.paths.bars?.({ size: [0.92, Infinity], align: 0 });
            return { ...base, fill: withAlpha(stroke, 0.45), paths: bars, points: { show: false } };
          }
          return base;
        }),
      ],
      hooks: {
        drawClear: under ? [(u) => under(u, colorOf)] : [],
        draw: over ? [(u) => over(u, colorOf)] : [],
        setCursor: [
          (u) => {
            const idx = u.cursor.idx;
            if (idx === null || idx === undefined) {
              setReading(null);
              return;
            }
            const xv = u.data[0][idx];
            setReading({
              x: typeof xv === "number" ? formatX(x, xv) : "",
              values: series.map((s, i) => {
                const at = u.cursor.idxs?.[i + 1] ?? idx;
                const v = (u.data[i + 1] as (number | null)[] | undefined)?.[at];
                return v === null || v === undefined ? null : readout(v, s.quantity);
              }),
            });
          },
        ],
        setScale: [
          (u, key) => {
            if (key !== "x" || !full) return;
            const { min, max } = u.scales.x ?? {};
            setZoomed(min !== undefined && max !== undefined && (min > full.min + 1e-9 * Math.abs(full.min || 1) || max < full.max - 1e-9 * Math.abs(full.max || 1)));
          },
        ],
      },
    };
    const u = new uPlot(opts, data as uPlot.AlignedData, el);
    plot.current = u;
    const resize = () => u.setSize({ width: Math.max(200, el.clientWidth), height });
    const observer = new ResizeObserver(resize);
    observer.observe(el);
    const beforePrint = () => u.setSize({ width: printWidth, height });
    window.addEventListener("beforeprint", beforePrint);
    window.addEventListener("afterprint", resize);
    return () => {
      observer.disconnect();
      window.removeEventListener("beforeprint", beforePrint);
      window.removeEventListener("afterprint", resize);
      u.destroy();
      plot.current = null;
    };
    // Series visibility is applied through setSeries, not by rebuilding the chart.
  }, [data, series, yAxes, x, height, under, over, compact, full]);

  const toggle = (i: number) => {
    const next = shown.map((v, k) => (k === i ? !v : v));
    setShown(next);
    plot.current?.setSeries(i + 1, { show: next[i] ?? true });
  };

  const reset = () => {
    if (plot.current && full) plot.current.setScale("x", full);
  };

  const moveCursor = (u: uPlot, idx: number) => {
    const xs = u.data[0];
    const clamped = Math.max(0, Math.min(xs.length - 1, idx));
    const xv = xs[clamped];
    if (typeof xv !== "number") return;
    const first = series.findIndex((_, i) => shown[i]);
    const ys = first >= 0 ? (u.data[first + 1] as (number | null)[]) : null;
    const near = ys ? nearestValue(ys, clamped) : null;
    const scale = series[first]?.scale ?? yAxes[0]?.scale ?? "y";
    const top = near ? u.valToPos(near.value, scale) : u.bbox.height / 2 / devicePixelRatio;
    u.setCursor({ left: u.valToPos(xv, "x"), top });
  };

  const onKey = (event: KeyboardEvent<HTMLDivElement>) => {
    const u = plot.current;
    if (!u) return;
    const xs = u.data[0];
    const min = u.scales.x?.min ?? xs[0] ?? 0;
    const max = u.scales.x?.max ?? xs[xs.length - 1] ?? 0;
    const firstVisible = Math.max(0, u.valToIdx(min));
    const lastVisible = Math.min(xs.length - 1, u.valToIdx(max));
    const current = u.cursor.idx ?? firstVisible;
    const step = event.shiftKey ? Math.max(1, Math.round((lastVisible - firstVisible) / 10)) : 1;
    let handled = true;
    if (event.key === "ArrowRight") moveCursor(u, current + step);
    else if (event.key === "ArrowLeft") moveCursor(u, current - step);
    else if (event.key === "Home") moveCursor(u, firstVisible);
    else if (event.key === "End") moveCursor(u, lastVisible);
    else if (!compact && (event.key === "+" || event.key === "=")) {
      const centre = xs[current] ?? (min + max) / 2;
      const half = (max - min) / 4;
      u.setScale("x", { min: Math.max(full?.min ?? -Infinity, centre - half), max: Math.min(full?.max ?? Infinity, centre + half) });
    } else if (!compact && event.key === "-") {
      const half = max - min;
      const centre = (min + max) / 2;
      u.setScale("x", { min: Math.max(full?.min ?? -Infinity, centre - half), max: Math.min(full?.max ?? Infinity, centre + half) });
    } else if (!compact && event.key === "Escape") reset();
    else handled = false;
    if (handled) {
      setKeyboard(true);
      event.preventDefault();
    }
  };

  return (
    <figure className="chart-figure break-inside-avoid" aria-labelledby={`${id}-title`}>
      <div className="mb-2 flex flex-wrap items-start justify-between gap-2">
        <figcaption id={`${id}-title`} className="text-sm font-semibold text-ink">
          {title}
        </figcaption>
        {compact ? null : (
          <button
            type="button"
            onClick={reset}
            disabled={!zoomed}
            className="no-print rounded border border-rule-strong bg-sheet px-2.5 py-1 text-xs font-medium text-ink hover:bg-paper disabled:opacity-40"
          >
            Reset zoom
          </button>
        )}
      </div>
      <p id={`${id}-summary`} className="sr-only print:not-sr-only print:mb-1 print:text-xs">
        {summary}
      </p>
      <div
        ref={box}
        tabIndex={0}
        role="img"
        aria-roledescription="chart"
        aria-labelledby={`${id}-title`}
        aria-describedby={`${id}-summary ${id}-help`}
        onKeyDown={onKey}
        onBlur={() => setKeyboard(false)}
        className="w-full rounded focus-visible:outline-3 focus-visible:outline-copper"
        style={{ minHeight: height }}
      />
      <p id={`${id}-help`} className="no-print mt-1 text-xs text-ink-soft">
        {compact
          ? "Point at the chart, or focus it and use the arrow keys, to read values."
          : "Drag across the chart to zoom in; double-click or Reset zoom to see it all. Focused: arrow keys move the read-out, + and − zoom, Esc resets."}
      </p>
      <output aria-live={keyboard ? "polite" : "off"} className="no-print mt-1 block min-h-5 text-xs tabular-nums text-ink">
        {reading ? (
          <>
            <span className="font-semibold">{x.quantity.label}</span> {reading.x}
            {series.map((s, i) =>
              shown[i] && reading.values[i] ? (
                <span key={s.label}>
                  <span aria-hidden="true" className="px-1.5 text-ink-soft">
                    ·
                  </span>
                  <span className="font-semibold">{s.label}</span> {reading.values[i]}
                </span>
              ) : null,
            )}
          </>
        ) : (
          <span className="text-ink-soft">Read-out: point at the chart.</span>
        )}
      </output>
      {compact && !legendExtra ? null : (
        <div className="mt-2 flex flex-wrap items-center gap-2 text-xs">
          {compact
            ? null
            : series.map((s, i) => (
                <button
                  key={s.label}
                  type="button"
                  aria-pressed={shown[i]}
                  onClick={() => toggle(i)}
                  className={`inline-flex items-center gap-1.5 rounded border px-2 py-1 ${shown[i] ? "border-rule-strong bg-sheet text-ink" : "border-rule bg-paper text-ink-soft line-through"}`}
                >
                  <LineSwatch color={s.color} dash={s.dash} kind={s.kind} />
                  {s.label}
                </button>
              ))}
          {legendExtra}
        </div>
      )}
    </figure>
  );
}

/** A legend sample of a trace: its colour and its dash, so the legend reads in grey print. */
function LineSwatch({ color, dash, kind }: { color: ColorToken; dash?: number[]; kind?: ChartSeries["kind"] }) {
  const stroke = `var(--color-${color})`;
  return (
    <svg width="26" height="10" aria-hidden="true" className="shrink-0">
      {kind === "bars" ? (
        <rect x="6" y="1" width="14" height="8" fill={stroke} fillOpacity={0.45} stroke={stroke} />
      ) : kind === "points" ? (
        <circle cx="13" cy="5" r="3" fill="white" stroke={stroke} strokeWidth="2" />
      ) : (
        <line x1="1" y1="5" x2="25" y2="5" stroke={stroke} strokeWidth="2" strokeDasharray={dash?.join(" ")} />
      )}
    </svg>
  );
}
