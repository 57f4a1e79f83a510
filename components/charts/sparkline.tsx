import { sparklinePath } from "@/lib/charts/sparkline";

/**
 * A voltage sparkline for a list row, drawn on the server as SVG. Decorative beside the numbers
 * it sits with, so it carries a short label rather than a full description.
 */
export function Sparkline({ x, y, label, width = 160, height = 36 }: { x: (number | null)[]; y: (number | null)[]; label: string; width?: number; height?: number }) {
  const d = sparklinePath(x, y, { width, height, pad: 2 });
  if (!d) return <span className="text-xs text-ink-soft">no trace</span>;
  return (
    <svg width={width} height={height} viewBox={`0 0 ${width} ${height}`} role="img" aria-label={label} className="block overflow-visible">
      <rect x="0.5" y="0.5" width={width - 1} height={height - 1} rx="3" fill="var(--color-paper)" stroke="var(--color-rule)" />
      <path d={d} fill="none" stroke="var(--color-ink)" strokeWidth="1.25" strokeLinejoin="round" />
    </svg>
  );
}
