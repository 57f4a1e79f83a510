/**
 * Means with their confidence intervals, one row per batch, as a plain SVG (the figures are also
 * in the table beside it, which is what a screen reader gets).
 */
export interface IntervalRow {
  label: string;
  mean: number;
  low: number;
  high: number;
}

export function MeanIntervals({ rows, unit, lsl, title }: { rows: readonly IntervalRow[]; unit: string; lsl?: number | null; title: string }) {
  if (rows.length === 0) return null;
  const width = 640;
  const rowHeight = 34;
  const left = 120;
  const right = 24;
  const top = 12;
  const axisHeight = 28;
  const values = rows.flatMap((r) => [r.low, r.high]).concat(lsl !== null && lsl !== undefined ? [lsl] : []);
  let min = Math.min(...values);
  let max = Math.max(...values);
  const pad = Math.max((max - min) * 0.08, 1);
  min -= pad;
  max += pad;
  const x = (v: number) => left + ((v - min) / (max - min)) * (width - left - right);
  const height = top + rows.length * rowHeight + axisHeight;
  const ticks = Array.from({ length: 5 }, (_, i) => min + ((max - min) * i) / 4);
  return (
    <figure>
      <figcaption className="mb-2 text-sm font-semibold">{title}</figcaption>
      <svg viewBox={`0 0 ${width} ${height}`} className="w-full max-w-3xl" role="img" aria-label={`${title}: ${rows.map((r) => `${r.label} mean ${r.mean.toFixed(1)} ${unit}, interval ${r.low.toFixed(1)} to ${r.high.toFixed(1)}`).join("; ")}`}>
        {lsl !== null && lsl !== undefined ? (
          <g>
            <line x1={x(lsl)} x2={x(lsl)} y1={top - 4} y2={top + rows.length * rowHeight} stroke="var(--color-danger)" strokeDasharray="4 3" />
            <text x={x(lsl) + 4} y={top + 6} fontSize="11" fill="var(--color-danger)">
              lower limit
            </text>
          </g>
        ) : null}
        {rows.map((r, i) => {
          const y = top + i * rowHeight + rowHeight / 2;
          return (
            <g key={r.label}>
              <text x={left - 8} y={y + 4} fontSize="12" textAnchor="end" fill="var(--color-ink)" fontFamily="var(--font-mono, monospace)">
                {r.label}
              </text>
              <line x1={x(r.low)} x2={x(r.high)} y1={y} y2={y} stroke="var(--color-ink)" strokeWidth="2" />
              <line x1={x(r.low)} x2={x(r.low)} y1={y - 6} y2={y + 6} stroke="var(--color-ink)" strokeWidth="2" />
              <line x1={x(r.high)} x2={x(r.high)} y1={y - 6} y2={y + 6} stroke="var(--color-ink)" strokeWidth="2" />
              <circle cx={x(r.mean)} cy={y} r="5" fill="var(--color-copper)" />
            </g>
          );
        })}
        <line x1={left} x2={width - right} y1={height - axisHeight + 4} y2={height - axisHeight + 4} stroke="var(--color-ink-soft)" />
        {ticks.map((t) => (
          <text key={t} x={x(t)} y={height - 6} fontSize="11" textAnchor="middle" fill="var(--color-ink-soft)">
            {t.toFixed(0)}
          </text>
        ))}
        <text x={width - right} y={height - axisHeight - 2} fontSize="11" textAnchor="end" fill="var(--color-ink-soft)">
          {unit}
        </text>
      </svg>
    </figure>
  );
}
