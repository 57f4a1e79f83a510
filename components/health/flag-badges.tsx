import { Badge, type BadgeTone } from "@/components/ui/badge";
import type { FlagState } from "@/lib/flags/vocabulary";

const tones: Record<FlagState, BadgeTone> = {
  open: "bad",
  acknowledged: "warn",
  "retest requested": "accent",
  cleared: "good",
  "cell retired": "neutral",
};

export function FlagStateBadge({ state }: { state: FlagState }) {
  return <Badge tone={tones[state]}>{state}</Badge>;
}
