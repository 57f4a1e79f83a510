/**
 * Turns an audit event's before/after JSON into field-by-field lines a reader can follow
 * ("role: technician → engineer"). Safe for client components: no server imports.
 */
export type FieldChangeKind = "added" | "removed" | "changed";

export interface FieldChange {
  /** Dotted path for nested values ("columnMap.voltage"); "value" when the whole record is not an object. */
  field: string;
  kind: FieldChangeKind;
  before: string | null;
  after: string | null;
}

type Leaves = Map<string, unknown>;

function isPlainObject(value: unknown): value is Record<string, unknown> {
  return typeof value === "object" && value !== null && !Array.isArray(value);
}

/** Nested objects become dotted paths; arrays stay whole, since their items have no names. */
function flatten(value: unknown, prefix: string, out: Leaves): Leaves {
  if (isPlainObject(value)) {
    const keys = Object.keys(value);
    if (keys.length === 0 && prefix) out.set(prefix, value);
    for (const key of keys) flatten(value[key], prefix ? `${prefix}.${key}` : key, out);
  } else if (value !== undefined) {
    out.set(prefix || "value", value);
  }
  return out;
}

/** How a recorded value reads: text as it is (React escapes markup when it renders), the rest as JSON. */
export function formatAuditValue(value: unknown): string {
  if (value === null || value === undefined) return "empty";
  if (typeof value === "string") return value === "" ? "empty" : value;
  if (typeof value === "number" || typeof value === "boolean") return String(value);
  return JSON.stringify(value);
}

function leavesOf(value: unknown): Leaves {
  return value === null || value === undefined ? new Map() : flatten(value, "", new Map());
}

/** The changed, added and removed fields, in the order the record lists them; unchanged fields are left out. */
export function diffAuditValues(before: unknown, after: unknown): FieldChange[] {
  const was = leavesOf(before);
  const now = leavesOf(after);
  const fields = [...new Set([...was.keys(), ...now.keys()])];
  const changes: FieldChange[] = [];
  for (const field of fields) {
    const hadIt = was.has(field);
    const hasIt = now.has(field);
    const b = hadIt ? formatAuditValue(was.get(field)) : null;
    const a = hasIt ? formatAuditValue(now.get(field)) : null;
    if (hadIt && hasIt) {
      if (JSON.stringify(was.get(field)) !== JSON.stringify(now.get(field))) changes.push({ field, kind: "changed", before: b, after: a });
    } else if (hasIt) changes.push({ field, kind: "added", before: null, after: a });
    else changes.push({ field, kind: "removed", before: b, after: null });
  }
  return changes;
}
