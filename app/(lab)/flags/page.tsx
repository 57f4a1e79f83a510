import type { Metadata } from "next";
import Link from "next/link";
import { DevInboxLink } from "@/components/health/dev-inbox-link";
import { FlagTable } from "@/components/health/flag-table";
import { RaiseFlagForm } from "@/components/health/raise-flag-form";
import { buttonClass } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";
import { PageTitle } from "@/components/ui/panel";
import { can } from "@/lib/auth/roles";
import { currentUser } from "@/lib/auth/session";
import { listFlags } from "@/lib/db/queries/flags";
import { listBatchOptions } from "@/lib/db/queries/registry";
import { byHandKind, flagRuleKinds, flagStates, kindTitle } from "@/lib/flags/vocabulary";
import { ensureOutboxSender } from "@/lib/mail/sender";
import { flagListQuery, type FlagListQuery } from "@/lib/validations/flags";

export const metadata: Metadata = { title: "Flags" };

type Search = { searchParams: Promise<Record<string, string | string[] | undefined>> };

function queryFrom(raw: Record<string, string | string[] | undefined>): FlagListQuery {
  const flat = Object.fromEntries(Object.entries(raw).flatMap(([k, v]) => (typeof v === "string" && v !== "" ? [[k, v]] : [])));
  const parsed = flagListQuery.safeParse(flat);
  return parsed.success ? parsed.data : flagListQuery.parse({});
}

function pageHref(query: FlagListQuery, page: number): string {
  const params = new URLSearchParams();
  if (query.state !== "unclosed") params.set("state", query.state);
  if (query.kind) params.set("kind", query.kind);
  if (query.batchId) params.set("batchId", query.batchId);
  if (query.q) params.set("q", query.q);
  if (page > 1) params.set("page", String(page));
  const text = params.toString();
  return text ? `/flags?${text}` : "/flags";
}

export default async function FlagsPage({ searchParams }: Search) {
  const query = queryFrom(await searchParams);
  const [user, page, batches] = await Promise.all([currentUser(), listFlags(query), listBatchOptions()]);
  ensureOutboxSender();
  const pages = Math.max(1, Math.ceil(page.total / page.pageSize));
  const labelClass = "block text-xs font-semibold uppercase tracking-wide text-ink-soft";
  return (
    <>
      <PageTitle
        kicker="Alerts"
        title="Flags"
        actions={
          <>
            {user ? <DevInboxLink role={user.role} /> : null}
            <Link href="/flags/rules" className={buttonClass()}>
              Rules and settings
            </Link>
          </>
        }
      />
      <div className="grid gap-6 lg:grid-cols-[1fr_22rem]">
        <section aria-labelledby="flag-list-title" className="space-y-3">
          <h2 id="flag-list-title" className="sr-only">
            Flag list
          </h2>
          <form method="get" className="flex flex-wrap items-end gap-3" role="search" aria-label="Filter flags">
            <label className="min-w-40">
              <span className={labelClass}>State</span>
              <select name="state" defaultValue={query.state} className={inputClass}>
                <option value="unclosed">Not yet closed</option>
                <option value="all">All</option>
                {flagStates.map((s) => (
                  <option key={s} value={s}>
                    {s}
                  </option>
                ))}
              </select>
            </label>
            <label className="min-w-48">
              <span className={labelClass}>What</span>
              <select name="kind" defaultValue={query.kind ?? ""} className={inputClass}>
                <option value="">Any</option>
                {[...flagRuleKinds, byHandKind].map((k) => (
                  <option key={k} value={k}>
                    {kindTitle(k)}
                  </option>
                ))}
              </select>
            </label>
            <label className="min-w-36">
              <span className={labelClass}>Batch</span>
              <select name="batchId" defaultValue={query.batchId ?? ""} className={inputClass}>
                <option value="">Any</option>
                {batches.map((b) => (
                  <option key={b.id} value={b.id}>
                    {b.lotCode}
                  </option>
                ))}
              </select>
            </label>
            <label className="min-w-40">
              <span className={labelClass}>Serial contains</span>
              <input name="q" defaultValue={query.q ?? ""} className={inputClass} autoComplete="off" spellCheck={false} />
            </label>
            <button type="submit" className={buttonClass()}>
              Show
            </button>
          </form>
          {page.items.length ? (
            <FlagTable flags={page.items} caption="Flags, open ones first" />
          ) : (
            <p className="rounded-lg border border-rule bg-sheet p-5 text-sm text-ink-soft">
              {query.state === "unclosed" && !query.kind && !query.batchId && !query.q ? "No flag is waiting. Rules run after every analysis." : "No flags match these filters."}
            </p>
          )}
          <nav aria-label="Pages" className="flex items-center gap-3 text-sm">
            <span>
              {page.total} flag{page.total === 1 ? "" : "s"}, page {page.page} of {pages}
            </span>
            {page.page > 1 ? (
              <Link href={pageHref(query, page.page - 1)} className="underline">
                Previous
              </Link>
            ) : null}
            {page.page < pages ? (
              <Link href={pageHref(query, page.page + 1)} className="underline">
                Next
              </Link>
            ) : null}
          </nav>
        </section>
        {user && can(user.role, "flag.raise") ? <RaiseFlagForm /> : null}
      </div>
    </>
  );
}
