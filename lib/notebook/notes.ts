/**
 * Notes are append-only: a correction is a new note that amends an earlier one. The page shows
 * every note as written, oldest first; an amended note stays visible, struck through, and names
 * the notes that amend it.
 */

export interface NoteEntry {
  id: number;
  authorName: string;
  /** ISO instant. */
  at: string;
  text: string;
  amends: number | null;
}

export interface ThreadedNote extends NoteEntry {
  /** Notes that amend this one, oldest first. */
  amendedBy: number[];
  /** The note this one amends, when it is still in the list. */
  amendsNote: NoteEntry | null;
}

export function threadNotes(notes: readonly NoteEntry[]): ThreadedNote[] {
  const sorted = [...notes].sort((a, b) => a.at.localeCompare(b.at) || a.id - b.id);
  const byId = new Map(sorted.map((n) => [n.id, n]));
  const amendedBy = new Map<number, number[]>();
  for (const n of sorted) {
    if (n.amends === null) continue;
    const list = amendedBy.get(n.amends) ?? [];
    list.push(n.id);
    amendedBy.set(n.amends, list);
  }
  return sorted.map((n) => ({ ...n, amendedBy: amendedBy.get(n.id) ?? [], amendsNote: n.amends === null ? null : (byId.get(n.amends) ?? null) }));
}
