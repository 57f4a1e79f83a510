/**
 * Which findings the notebook shows as safety findings: the cell went outside a limit of its
 * type (voltage, current, temperature), or the engine rated it dangerous. Findings that carry a
 * caution for other reasons (a charge that stopped before its termination current) are shown
 * with their caution among the other findings, not behind a red banner.
 */
import type { FindingKind } from "@/lib/analysis/types";

export const limitKinds: readonly FindingKind[] = [
  "over-voltage",
  "under-voltage",
  "charge-over-current",
  "discharge-over-current",
  "charge-temperature",
  "discharge-temperature",
];

export function isSafetyFinding(finding: { kind: string; severity: string }): boolean {
  return finding.severity === "danger" || (limitKinds as readonly string[]).includes(finding.kind);
}
