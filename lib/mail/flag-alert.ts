/**
 * The e-mail an engineer gets when a flag opens. Plain text: it reads the same in every mail
 * program, and nothing from a record can turn into markup.
 */
import { cellHref } from "@/lib/registry/links";
import { cellHealthHref, flagHref } from "@/lib/flags/links";
import { kindTitle, valueAgainstBound } from "@/lib/flags/vocabulary";

export interface OpenedFlag {
  id: string;
  kind: string;
  summary: string;
  value: number | null;
  bound: number | null;
  unit: string | null;
  serial: string;
  lotCode: string | null;
  /** The rule in one line with its bound, or null for a flag raised by hand. */
  ruleLine: string | null;
  raisedByName: string | null;
  reason: string | null;
  /** Safety cautions of the findings behind a danger flag. */
  cautions: string[];
}

export function flagAlert(flag: OpenedFlag, baseUrl: string): { subject: string; text: string } {
  const base = baseUrl.replace(/\/+$/, "");
  const where = flag.lotCode ? `cell ${flag.serial} (batch ${flag.lotCode})` : `cell ${flag.serial}`;
  const figures = valueAgainstBound(flag);
  const lines = [
    `A flag opened on ${where}.`,
    "",
    flag.ruleLine ? `Rule: ${flag.ruleLine}` : `Raised by hand by ${flag.raisedByName ?? "an engineer"}.`,
    `Finding: ${flag.summary}`,
    ...(figures ? [`Value: ${figures}`] : []),
    ...(flag.reason ? [`Reason: ${flag.reason}`] : []),
    "",
    `Cell: ${base}${cellHref(flag.serial)}`,
    `Fade and health: ${base}${cellHealthHref(flag.serial)}`,
    `Flag and its history: ${base}${flagHref(flag.id)}`,
  ];
  if (flag.cautions.length > 0) {
    lines.push("", "Safety:", ...[...new Set(flag.cautions)].map((c) => `- ${c}`));
  }
  lines.push("", "You get this mail because you are an engineer in Kneepoint. Acknowledge, request a retest or clear the flag on its page.");
  return { subject: `Flag on cell ${flag.serial}: ${kindTitle(flag.kind)}`, text: lines.join("\n") };
}
