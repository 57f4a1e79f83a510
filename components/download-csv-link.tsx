import { toSearch } from "@/lib/api/query-keys";

/**
 * "Download CSV" for a server-filtered table: the same filters and order, every page. A plain
 * link, so the browser's own download handling (and the session cookie) does the work.
 */
export function DownloadCsvLink({ href, filters, label = "Download CSV" }: { href: string; filters: Record<string, string | number | undefined>; label?: string }) {
  return (
    <a
      href={`${href}${toSearch(filters)}`}
      download
      className="ml-auto inline-flex items-center rounded-md border border-rule-strong bg-sheet px-3 py-2 text-sm font-medium text-ink hover:bg-paper"
    >
      {label}
    </a>
  );
}
