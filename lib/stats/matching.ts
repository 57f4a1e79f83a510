/**
 * Matched sets of cells for series packs: every set of `setSize` cells keeps its capacity spread
 * and its DCIR spread within tolerances. Spread = (max − min)/set mean × 100 %. The tolerances
 * are settings: capacity within about 1–3 % and DCIR within about 1–5 % are vendor guidance for
 * pack building, not a standard (see /work/shared/notes/domain.md, "Matching cells").
 *
 * Greedy algorithm (documented, not optimal):
 *  1. Sort cells by capacity (ties by serial) and take the lowest unused cell as the anchor.
 *  2. Its window is the unused cells with capacity ≤ anchor × (1 + tolerance). Because the set
 *     mean is at least the anchor's capacity, any set drawn from the window meets the capacity
 *     tolerance; the window is thus slightly stricter than the rule itself.
 *  3. Without DCIR: the anchor and the next setSize − 1 cells by capacity. With DCIR: among the
 *     window's runs of setSize consecutive cells in DCIR order that contain the anchor, the run with
 *     the smallest DCIR spread; it must meet the DCIR tolerance.
 *  4. If no set can be formed the anchor is left over with the reason; repeat from 1.
 * A cell the greedy pass leaves over might still fit in a set that an exhaustive search would find.
 */

export interface MatchCell {
  serial: string;
  capacity_mAh: number;
  dcir_mOhm?: number | null;
}

export interface MatchOptions {
  setSize: number;
  /** Capacity spread allowed in a set, % of the set mean; default 2. */
  capacityTolerance_pct?: number;
  /** DCIR spread allowed in a set, % of the set mean; default 5; null to ignore DCIR. */
  dcirTolerance_pct?: number | null;
}

export interface MatchedSet {
  serials: string[];
  meanCapacity_mAh: number;
  capacitySpread_pct: number;
  meanDcir_mOhm: number | null;
  dcirSpread_pct: number | null;
}

export interface LeftOver {
  serial: string;
  reason: string;
}

export interface MatchResult {
  setSize: number;
  capacityTolerance_pct: number;
  /** Null when DCIR was not checked (switched off, or no cell has a DCIR value). */
  dcirTolerance_pct: number | null;
  sets: MatchedSet[];
  leftOver: LeftOver[];
}

interface Cell {
  serial: string;
  capacity: number;
  dcir: number | null;
}

/** (max − min)/mean × 100. */
export function spreadPct(values: readonly number[]): number {
  const lo = Math.min(...values);
  const hi = Math.max(...values);
  const m = values.reduce((s, v) => s + v, 0) / values.length;
  return ((hi - lo) / m) * 100;
}

function meanOf(values: readonly number[]): number {
  return values.reduce((s, v) => s + v, 0) / values.length;
}

function toSet(members: readonly Cell[], checkDcir: boolean): MatchedSet {
  const caps = members.map((c) => c.capacity);
  const dcirs = members.map((c) => c.dcir as number);
  return {
    serials: members.map((c) => c.serial),
    meanCapacity_mAh: meanOf(caps),
    capacitySpread_pct: spreadPct(caps),
    meanDcir_mOhm: checkDcir ? meanOf(dcirs) : null,
    dcirSpread_pct: checkDcir ? spreadPct(dcirs) : null,
  };
}

/** The best run of `size` cells in DCIR order that contains the anchor, by DCIR spread. */
function bestDcirRun(window: readonly Cell[], anchor: Cell, size: number): { members: Cell[]; spread: number } | null {
  const byDcir = [...window].sort((a, b) => (a.dcir as number) - (b.dcir as number) || a.serial.localeCompare(b.serial));
  const at = byDcir.indexOf(anchor);
  let best: { members: Cell[]; spread: number } | null = null;
  for (let start = Math.max(0, at - size + 1); start <= at && start + size <= byDcir.length; start++) {
    const members = byDcir.slice(start, start + size);
    const spread = spreadPct(members.map((c) => c.dcir as number));
    if (!best || spread < best.spread) best = { members, spread };
  }
  return best;
}

function validate(cells: readonly MatchCell[], setSize: number, capTol: number, dcirTol: number | null): void {
  if (!Number.isInteger(setSize) || setSize < 2) throw new RangeError(`set size must be an integer of at least 2, got ${setSize}`);
  if (!(capTol >= 0)) throw new RangeError(`capacity tolerance must be at least 0, got ${capTol}`);
  if (dcirTol !== null && !(dcirTol >= 0)) throw new RangeError(`DCIR tolerance must be at least 0, got ${dcirTol}`);
  const seen = new Set<string>();
  for (const c of cells) {
    if (!(c.capacity_mAh > 0) || !Number.isFinite(c.capacity_mAh)) throw new RangeError(`capacity of ${c.serial} must be positive`);
    if (c.dcir_mOhm !== null && c.dcir_mOhm !== undefined && !(c.dcir_mOhm > 0)) throw new RangeError(`DCIR of ${c.serial} must be positive`);
    if (seen.has(c.serial)) throw new RangeError(`serial ${c.serial} appears twice`);
    seen.add(c.serial);
  }
}

/** Groups cells into matched sets; see the module comment for the algorithm. */
export function matchCells(cells: readonly MatchCell[], options: MatchOptions): MatchResult {
  const setSize = options.setSize;
  const capTol = options.capacityTolerance_pct ?? 2;
  const requestedDcirTol = options.dcirTolerance_pct === undefined ? 5 : options.dcirTolerance_pct;
  validate(cells, setSize, capTol, requestedDcirTol);
  const all: Cell[] = cells.map((c) => ({ serial: c.serial, capacity: c.capacity_mAh, dcir: c.dcir_mOhm ?? null }));
  const checkDcir = requestedDcirTol !== null && all.some((c) => c.dcir !== null);
  const leftOver: LeftOver[] = [];
  let pool = all;
  if (checkDcir) {
    for (const c of all) if (c.dcir === null) leftOver.push({ serial: c.serial, reason: "no DCIR measurement" });
    pool = all.filter((c) => c.dcir !== null);
  }
  const unused = [...pool].sort((a, b) => a.capacity - b.capacity || a.serial.localeCompare(b.serial));
  const sets: MatchedSet[] = [];
  while (unused.length > 0) {
    if (unused.length < setSize) {
      for (const c of unused) leftOver.push({ serial: c.serial, reason: `only ${unused.length} cell(s) left, fewer than a set of ${setSize}` });
      break;
    }
    const anchor = unused[0] as Cell;
    const limit = anchor.capacity * (1 + capTol / 100);
    const window = unused.filter((c) => c.capacity <= limit);
    let members: Cell[] | null = null;
    let reason = "";
    if (window.length < setSize) {
      reason = `only ${window.length - 1} other cell(s) within ${capTol} % capacity, a set needs ${setSize - 1}`;
    } else if (!checkDcir) {
      members = window.slice(0, setSize);
    } else {
      const run = bestDcirRun(window, anchor, setSize);
      if (run && run.spread <= (requestedDcirTol as number)) members = run.members;
      else reason = `closest DCIR partners within capacity tolerance spread ${run ? run.spread.toFixed(1) : "?"} %, over ${requestedDcirTol} %`;
    }
    if (members) {
      sets.push(toSet(members, checkDcir));
      const taken = new Set(members);
      for (let i = unused.length - 1; i >= 0; i--) if (taken.has(unused[i] as Cell)) unused.splice(i, 1);
    } else {
      leftOver.push({ serial: anchor.serial, reason });
      unused.shift();
    }
  }
  return {
    setSize,
    capacityTolerance_pct: capTol,
    dcirTolerance_pct: checkDcir ? requestedDcirTol : null,
    sets,
    leftOver,
  };
}
