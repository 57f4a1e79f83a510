/**
 * Which column is which: header words, unit markers and the sample values
 * together give each column a score per role; the best scores win.
 */
import { classifyMode } from "./mode-words";
import type { DecimalMark, Layout } from "./sniff";
import { isBlankText, parseHmsText, parseNumberText, parseTimestampText } from "./text-values";
import { splitHeader, type UnitMarker, parseUnitToken } from "./units";
import { ambientWords, excludedWords, hasAnyWord, hasRoleWord, normaliseWords, setpointWords, stepClockWords, type WordRole } from "./vocabulary";

export interface ColumnFacts {
  index: number;
  name: string;
  label: string;
  words: string[];
  unit: UnitMarker | null;
  filled: number;
  numericShare: number;
  hmsShare: number;
  timestampShare: number;
  modeShare: number;
  nonDecreasing: boolean;
  integers: boolean;
  hasNegative: boolean;
  medianAbs: number;
}

function median(values: number[]): number {
  if (values.length === 0) return Number.NaN;
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2;
}

function timeValue(cell: string, decimal: DecimalMark): number {
  const n = parseNumberText(cell, decimal);
  if (!Number.isNaN(n)) return n;
  const hms = parseHmsText(cell);
  if (!Number.isNaN(hms)) return hms;
  const ts = parseTimestampText(cell);
  return ts === null ? Number.NaN : ts.whole + ts.frac;
}

export function columnFacts(layout: Layout): ColumnFacts[] {
  const width = Math.max(layout.header.length, ...layout.sample.map((r) => r.cells.length));
  const facts: ColumnFacts[] = [];
  for (let index = 0; index < width; index++) {
    const name = layout.header[index] ?? "";
    const parts = splitHeader(name);
    const fromUnitRow = layout.unitRow ? parseUnitToken(layout.unitRow.cells[index] ?? "") : null;
    const cells = layout.sample.map((r) => r.cells[index] ?? "").filter((c) => !isBlankText(c));
    const numbers = cells.map((c) => parseNumberText(c, layout.decimal)).filter((n) => !Number.isNaN(n));
    const times = cells.map((c) => timeValue(c, layout.decimal)).filter((n) => !Number.isNaN(n));
    const share = (count: number): number => (cells.length === 0 ? 0 : count / cells.length);
    // Mostly non-decreasing: one stray row (a cut-off last line, a glitch) must not hide a time or record column.
    let steps = 0;
    for (let k = 1; k < times.length; k++) if (times[k]! >= times[k - 1]!) steps++;
    const nonDecreasing = times.length >= 2 && steps >= 0.95 * (times.length - 1);
    facts.push({
      index,
      name,
      label: parts.label,
      words: normaliseWords(parts.label),
      unit: parts.unit ?? fromUnitRow,
      filled: cells.length,
      numericShare: share(numbers.length),
      hmsShare: share(cells.filter((c) => !Number.isNaN(parseHmsText(c))).length),
      timestampShare: share(cells.filter((c) => parseTimestampText(c) !== null).length),
      modeShare: share(cells.filter((c) => !Number.isNaN(classifyMode(c)) && Number.isNaN(parseNumberText(c, layout.decimal))).length),
      nonDecreasing,
      integers: numbers.length > 0 && numbers.every(Number.isInteger),
      hasNegative: numbers.some((n) => n < 0),
      medianAbs: median(numbers.map(Math.abs)),
    });
  }
  return facts;
}

export type ChosenRole = WordRole;

export interface RoleChoice {
  index: number;
  confidence: number;
}

type Scorer = (f: ColumnFacts) => number;

function unitIs(f: ColumnFacts, quantity: UnitMarker["quantity"]): boolean {
  return f.unit?.quantity === quantity;
}

/** A quantity column: its word, its unit, numeric values. Single letters (U, I) count for less. */
function quantityScore(f: ColumnFacts, role: "voltage" | "current" | "temperature", letters: readonly string[]): number {
  if (hasAnyWord(f.words, excludedWords)) return 0;
  if (f.unit !== null && !unitIs(f, role)) return 0;
  const word = hasRoleWord(f.words, role);
  const letter = f.words.length === 1 && letters.includes(f.label);
  let score = word && !letter ? 0.6 : letter ? 0.45 : f.unit !== null && f.words.length === 0 ? 0.35 : 0;
  if (score === 0) return 0;
  if (f.unit !== null) score += 0.3;
  if (f.numericShare < 0.5) return 0;
  if (f.numericShare >= 0.9) score += 0.2;
  if (hasAnyWord(f.words, setpointWords)) score *= 0.6;
  if (role === "temperature" && hasAnyWord(f.words, ambientWords)) score *= 0.6;
  return score;
}

const scorers: Record<ChosenRole, Scorer> = {
  time: (f) => {
    if (hasAnyWord(f.words, excludedWords)) return 0;
    if (f.unit !== null && !unitIs(f, "time")) return 0;
    const word = hasRoleWord(f.words, "time");
    let score = word ? (hasAnyWord(f.words, stepClockWords) ? 0.45 : 0.6) : f.label === "t" ? 0.45 : f.unit !== null && f.words.length === 0 ? 0.35 : 0;
    if (score === 0) return 0;
    const formatted = f.timestampShare >= 0.9 || f.hmsShare >= 0.9;
    if (f.unit !== null || formatted) score += 0.3;
    const readable = Math.max(f.numericShare, f.hmsShare, f.timestampShare);
    if (readable < 0.5) return 0;
    if (readable >= 0.9 && f.nonDecreasing) score += 0.2;
    else if (!f.nonDecreasing) score *= 0.5;
    return score;
  },
  voltage: (f) => quantityScore(f, "voltage", ["U", "V", "u", "v", "E"]),
  current: (f) => quantityScore(f, "current", ["I", "i"]),
  temperature: (f) => quantityScore(f, "temperature", ["T"]),
  mode: (f) => {
    if (f.modeShare < 0.9) return 0;
    return hasRoleWord(f.words, "mode") ? 0.95 : 0.7;
  },
  step: (f) => countScore(f, "step"),
  cycle: (f) => countScore(f, "cycle"),
  record: (f) => {
    if (!hasRoleWord(f.words, "record") && f.name.trim() !== "#") return 0;
    if (hasRoleWord(f.words, "step") || hasRoleWord(f.words, "cycle") || hasRoleWord(f.words, "time")) return 0;
    return f.integers && f.numericShare >= 0.9 && f.nonDecreasing ? 0.85 : 0;
  },
};

function countScore(f: ColumnFacts, role: "step" | "cycle"): number {
  if (!hasRoleWord(f.words, role) || unitIs(f, "time") || hasRoleWord(f.words, "time")) return 0;
  return f.integers && f.numericShare >= 0.9 ? 0.9 : 0;
}

export type ColumnChoices = Partial<Record<ChosenRole, RoleChoice>>;

/** Greedy assignment: the highest score anywhere first, one role per column and one column per role. */
export function chooseColumns(facts: readonly ColumnFacts[]): ColumnChoices {
  const scored: { role: ChosenRole; index: number; score: number }[] = [];
  for (const f of facts)
    for (const role of Object.keys(scorers) as ChosenRole[]) {
      const score = scorers[role](f);
      if (score > 0) scored.push({ role, index: f.index, score });
    }
  scored.sort((a, b) => b.score - a.score || a.index - b.index);
  const choices: ColumnChoices = {};
  const taken = new Set<number>();
  for (const s of scored) {
    if (choices[s.role] !== undefined || taken.has(s.index)) continue;
    choices[s.role] = { index: s.index, confidence: Math.min(1, Math.round(s.score * 100) / 100) };
    taken.add(s.index);
  }
  return choices;
}
