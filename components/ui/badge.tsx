import type { ReactNode } from "react";

export type BadgeTone = "neutral" | "good" | "warn" | "bad" | "accent";

const tones: Record<BadgeTone, string> = {
  neutral: "bg-paper text-ink-soft ring-rule-strong",
  good: "bg-ok-wash text-ok ring-ok/40",
  warn: "bg-warn-wash text-warn ring-warn/40",
  bad: "bg-danger-wash text-danger ring-danger/40",
  accent: "bg-copper-wash text-copper-dark ring-copper/40",
};

export function Badge({ tone = "neutral", children }: { tone?: BadgeTone; children: ReactNode }) {
  return <span className={`inline-flex items-center rounded px-2 py-0.5 text-xs font-medium ring-1 ring-inset ${tones[tone]}`}>{children}</span>;
}

export const dispositionTone: Record<string, BadgeTone> = { pending: "neutral", accepted: "good", rejected: "bad", "on hold": "warn" };
export const cellStatusTone: Record<string, BadgeTone> = { active: "good", flagged: "warn", retired: "neutral" };
