import type { StepKind } from "@/lib/analysis/types";
import { stepKindWords } from "@/lib/charts/step-bands";

/** Swatches in the shading's own strengths (lib/charts/step-bands.ts bandAlpha), written out so Tailwind sees them. */
const swatch: Record<StepKind, string> = {
  "constant-current charge": "bg-charge/20",
  "constant-voltage charge": "bg-charge/10 bg-[repeating-linear-gradient(135deg,transparent_0_3px,color-mix(in_srgb,var(--color-charge)_45%,transparent)_3px_4px)]",
  "constant-current discharge": "bg-discharge/20",
  rest: "bg-rest/15",
  other: "bg-copper/10",
};

/** What the shading behind a time chart means, in plain words. */
export function StepLegend({ kinds, withSwitch }: { kinds: StepKind[]; withSwitch: boolean }) {
  if (kinds.length === 0) return null;
  return (
    <ul aria-label="Shading by step kind" className="flex flex-wrap items-center gap-x-3 gap-y-1 text-xs text-ink-soft">
      {kinds.map((k) => (
        <li key={k} className="inline-flex items-center gap-1.5">
          <span aria-hidden="true" className={`inline-block h-3 w-5 rounded-sm border border-rule-strong ${swatch[k]}`} />
          {stepKindWords[k]}
        </li>
      ))}
      {withSwitch ? (
        <li className="inline-flex items-center gap-1.5">
          <svg width="14" height="14" aria-hidden="true">
            <line x1="7" y1="0" x2="7" y2="14" stroke="var(--color-copper-dark)" strokeWidth="1.5" strokeDasharray="4 2" />
            <circle cx="7" cy="7" r="3.5" fill="white" stroke="var(--color-copper-dark)" strokeWidth="1.5" />
          </svg>
          switch from constant current to constant voltage (CC→CV)
        </li>
      ) : null}
    </ul>
  );
}
