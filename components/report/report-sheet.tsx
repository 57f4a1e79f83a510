import Image from "next/image";
import Link from "next/link";
import type { ReactNode } from "react";
import { roleLabels, type Role } from "@/lib/auth/roles";
import { formatUtc } from "@/lib/notebook/format";
import { PrintButton } from "./print-button";

/**
 * A printable record: sized on screen to the printed width of an A4 page (210 mm less 14 mm
 * margins), so charts drawn for the screen print at the same size.
 */
export function ReportSheet({
  kind,
  subject,
  back,
  printedBy,
  children,
}: {
  kind: string;
  subject: ReactNode;
  back: { href: string; label: string };
  printedBy: { name: string; role: Role };
  children: ReactNode;
}) {
  // The report is drawn on request: it is prepared now, from the records as they stand.
  const printedAt = new Date();
  return (
    <>
      <div className="no-print mx-auto mb-4 flex w-full max-w-[182mm] flex-wrap items-center justify-between gap-3">
        <Link href={back.href} className="text-sm text-copper-dark underline-offset-2 hover:underline">
          ← {back.label}
        </Link>
        <PrintButton />
      </div>
      <article className="report-sheet mx-auto w-full max-w-[182mm] bg-sheet text-ink print:max-w-none" aria-label={kind}>
        <header className="flex items-start justify-between gap-4 border-b-2 border-ink pb-3">
          <div>
            <p className="text-xs font-semibold uppercase tracking-[0.14em] text-copper">Kneepoint · {kind}</p>
            <h1 className="text-2xl font-semibold tracking-tight">{subject}</h1>
          </div>
          <Image src="/kneepoint-mark.svg" alt="" width={36} height={36} />
        </header>
        <p className="mt-2 text-xs text-ink-soft" data-testid="report-printed">
          Prepared {formatUtc(printedAt)} for {printedBy.name} ({roleLabels[printedBy.role]}). Figures are those stored when the report was prepared; times are UTC.
        </p>
        <div className="mt-4 space-y-6">{children}</div>
        <footer className="mt-8 border-t border-rule pt-2 text-[11px] text-ink-soft">
          End of report. Each run&apos;s raw file can be checked against the SHA-256 shown here; the audit trail keeps every change to these records.
        </footer>
      </article>
    </>
  );
}

/** One part of a report, kept on one page where it fits. */
export function ReportSection({ title, children, id }: { title: string; children: ReactNode; id?: string }) {
  const headingId = id ?? `section-${title.toLowerCase().replace(/[^a-z0-9]+/g, "-")}`;
  return (
    <section aria-labelledby={headingId} className="report-section">
      <h2 id={headingId} className="mb-2 border-b border-rule pb-1 text-base font-semibold">
        {title}
      </h2>
      {children}
    </section>
  );
}
