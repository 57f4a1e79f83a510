"use client";

/** Opens the browser's print dialog, where the report can also be saved as a PDF. */
export function PrintButton() {
  return (
    <button type="button" onClick={() => window.print()} className="no-print rounded-md bg-ink px-3 py-1.5 text-sm font-medium text-paper hover:bg-ink/85 focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-copper">
      Print or save as PDF
    </button>
  );
}
