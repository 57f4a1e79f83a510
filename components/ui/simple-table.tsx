import type { ReactNode } from "react";

export interface SimpleHeader {
  key: string;
  label: ReactNode;
  right?: boolean;
}

/** Class for a body cell of a SimpleTable; `right` for numbers. */
export function cellClass(right = false): string {
  return `border-b border-rule/60 px-3 py-2 ${right ? "text-right tabular-nums" : ""}`;
}

/**
 * A small table rendered whole (no server paging): a start-page block, a preview, a list of tens.
 * `boxed` gives it the sheet and border the paged tables have.
 */
export function SimpleTable({ caption, headers, boxed = false, children }: { caption: string; headers: SimpleHeader[]; boxed?: boolean; children: ReactNode }) {
  return (
    <div className={`overflow-x-auto ${boxed ? "rounded-lg border border-rule bg-sheet" : ""}`}>
      <table className="min-w-full text-sm">
        <caption className="sr-only">{caption}</caption>
        <thead className={`text-left text-xs uppercase tracking-wide text-ink-soft ${boxed ? "bg-paper" : ""}`}>
          <tr>
            {headers.map((h) => (
              <th key={h.key} scope="col" className={`border-b border-rule px-3 py-2 font-semibold ${h.right ? "text-right" : ""}`}>
                {h.label}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>{children}</tbody>
      </table>
    </div>
  );
}

/** Headers from plain labels; a label ending in "#" is right-aligned (a number column), without the "#". */
export function headersOf(...labels: string[]): SimpleHeader[] {
  return labels.map((label) => (label.endsWith("#") ? { key: label, label: label.slice(0, -1), right: true } : { key: label, label }));
}
