/**
 * Canvas drawing for uPlot hooks: step shading under the traces, and markers (the CC→CV switch,
 * spec limits) over them. Positions come from uPlot in canvas pixels; everything is clipped to
 * the plotting area so a zoomed chart does not paint over its axes.
 */
import type uPlot from "uplot";
import type { ColorToken } from "@/lib/charts/colors";
import type { ColorOf } from "./uplot-chart";

export interface Shade {
  from: number;
  to: number;
  token: ColorToken;
  alpha: number;
  /** Diagonal hatching over the fill, to tell a phase apart without relying on shade alone. */
  hatch?: boolean;
}

function hatching(ctx: CanvasRenderingContext2D, stroke: string, dpr: number): CanvasPattern | null {
  const size = Math.round(8 * dpr);
  const tile = document.createElement("canvas");
  tile.width = size;
  tile.height = size;
  const t = tile.getContext("2d");
  if (!t) return null;
  t.strokeStyle = stroke;
  t.lineWidth = Math.max(1, dpr);
  t.beginPath();
  t.moveTo(0, size);
  t.lineTo(size, 0);
  t.stroke();
  return ctx.createPattern(tile, "repeat");
}

function clipped(u: uPlot, paint: (ctx: CanvasRenderingContext2D) => void): void {
  const { ctx, bbox } = u;
  ctx.save();
  ctx.beginPath();
  ctx.rect(bbox.left, bbox.top, bbox.width, bbox.height);
  ctx.clip();
  paint(ctx);
  ctx.restore();
}

export function drawShades(u: uPlot, shades: readonly Shade[], color: ColorOf): void {
  const dpr = typeof devicePixelRatio === "number" ? devicePixelRatio : 1;
  clipped(u, (ctx) => {
    for (const s of shades) {
      const x0 = u.valToPos(s.from, "x", true);
      const x1 = u.valToPos(s.to, "x", true);
      if (!(x1 > u.bbox.left) || !(x0 < u.bbox.left + u.bbox.width)) continue;
      ctx.fillStyle = color(s.token, s.alpha);
      ctx.fillRect(x0, u.bbox.top, x1 - x0, u.bbox.height);
      const pattern = s.hatch ? hatching(ctx, color(s.token, 0.45), dpr) : null;
      if (pattern) {
        ctx.fillStyle = pattern;
        ctx.fillRect(x0, u.bbox.top, x1 - x0, u.bbox.height);
      }
    }
  });
}

export interface Marker {
  x: number;
  /** A point on the marker, on `scale`. */
  y?: number | null;
  label: string;
}

/**
 * Dashed vertical lines with a label at the top, and a ringed point where `y` is given. When
 * markers crowd (a cycle-life log has one switch per cycle), lines and labels are left out, so
 * the points stay readable; otherwise a label that would overlap the one before is skipped.
 */
export function drawMarkers(u: uPlot, markers: readonly Marker[], scale: string, token: ColorToken, color: ColorOf): void {
  const dpr = typeof devicePixelRatio === "number" ? devicePixelRatio : 1;
  const xs = markers.map((m) => u.valToPos(m.x, "x", true)).filter((x) => x >= u.bbox.left && x <= u.bbox.left + u.bbox.width);
  const crowded = xs.length > 1 && (Math.max(...xs) - Math.min(...xs)) / (xs.length - 1) < 24 * dpr;
  clipped(u, (ctx) => {
    ctx.strokeStyle = color(token);
    ctx.lineWidth = 1.5 * dpr;
    ctx.font = `600 ${11 * dpr}px ${getComputedStyle(document.body).fontFamily}`;
    // uPlot leaves its own alignment on the context after drawing the axes; the label maths below assume left-aligned text.
    ctx.textAlign = "left";
    ctx.textBaseline = "alphabetic";
    let labelEnd = -Infinity;
    for (const m of markers) {
      const x = u.valToPos(m.x, "x", true);
      if (!crowded) {
        ctx.setLineDash([5 * dpr, 3 * dpr]);
        ctx.beginPath();
        ctx.moveTo(x, u.bbox.top);
        ctx.lineTo(x, u.bbox.top + u.bbox.height);
        ctx.stroke();
        ctx.setLineDash([]);
      }
      if (m.y !== null && m.y !== undefined && Number.isFinite(m.y)) {
        const y = u.valToPos(m.y, scale, true);
        ctx.beginPath();
        ctx.arc(x, y, (crowded ? 3 : 4.5) * dpr, 0, 2 * Math.PI);
        ctx.fillStyle = color("sheet");
        ctx.fill();
        ctx.stroke();
      }
      // Labels sit right of the line, or left of it near the right edge; one that would overlap the last is skipped.
      const width = ctx.measureText(m.label).width;
      const right = x + 4 * dpr + width < u.bbox.left + u.bbox.width;
      const start = right ? x + 4 * dpr : x - 4 * dpr - width;
      // Crowded markers go unlabelled: the legend names them.
      if (crowded || start < labelEnd + 6 * dpr) continue;
      ctx.fillStyle = color(token);
      ctx.fillText(m.label, start, u.bbox.top + 12 * dpr);
      labelEnd = start + width;
    }
  });
}
