import { diffAuditValues, type FieldChange } from "@/lib/audit/diff";

const collapseAbove = 4;

function ChangeLine({ change }: { change: FieldChange }) {
  return (
    <li className="break-words">
      <span className="font-mono text-xs text-ink-soft">{change.field}</span>{" "}
      {change.kind === "changed" ? (
        <>
          <del className="text-danger decoration-danger/60">{change.before}</del> <span aria-label="became">→</span>{" "}
          <ins className="text-ok no-underline">{change.after}</ins>
        </>
      ) : change.kind === "added" ? (
        <ins className="no-underline">{change.after}</ins>
      ) : (
        <>
          <del className="text-danger decoration-danger/60">{change.before}</del> <span className="text-ink-soft">(removed)</span>
        </>
      )}
    </li>
  );
}

/**
 * Before → after of one audit event as readable lines. Values are rendered as React text, so a
 * serial or note holding markup shows as the characters typed, never as markup.
 */
export function AuditDiff({ before, after, expanded = false }: { before: unknown; after: unknown; expanded?: boolean }) {
  const changes = diffAuditValues(before, after);
  if (changes.length === 0) return <span className="text-ink-soft">no recorded values</span>;
  const list = (
    <ul className="space-y-0.5">
      {changes.map((change) => (
        <ChangeLine key={change.field} change={change} />
      ))}
    </ul>
  );
  // Paper cannot open a disclosure: a printed record shows every field.
  if (expanded || changes.length <= collapseAbove) return list;
  return (
    <details>
      <summary className="cursor-pointer text-copper-dark">{changes.length} fields</summary>
      <div className="mt-1">{list}</div>
    </details>
  );
}
