import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { cache } from "react";
import { z } from "zod";
import { FlagStateBadge } from "@/components/health/flag-badges";
import { FlagHistoryTable } from "@/components/health/flag-history-table";
import { SafetyCautions } from "@/components/safety-cautions";
import { Facts } from "@/components/ui/facts";
import { PageTitle, Panel } from "@/components/ui/panel";
import { cellClass, headersOf, SimpleTable } from "@/components/ui/simple-table";
import { can } from "@/lib/auth/roles";
import { currentUser } from "@/lib/auth/session";
import { getFlagDetail } from "@/lib/db/queries/flags";
import { messagesOfFlag } from "@/lib/db/queries/outbox";
import { cellHealthHref, runHref } from "@/lib/flags/links";
import { isClosed, kindTitle, valueAgainstBound } from "@/lib/flags/vocabulary";
import { formatDateTime } from "@/lib/notebook/format";
import { batchHref } from "@/lib/registry/links";
import { TransitionForm } from "../_components/transition-form";

type Params = { params: Promise<{ flagId: string }> };

const flagById = cache(async (flagId: string) => (z.uuid().safeParse(flagId).success ? getFlagDetail(flagId) : null));

export async function generateMetadata({ params }: Params): Promise<Metadata> {
  const found = await flagById((await params).flagId);
  return { title: found ? `Flag on ${found.serial}` : "Flag" };
}

function findingsOf(detail: unknown): { message: string; caution: string }[] {
  const findings = (detail as { findings?: unknown } | null)?.findings;
  if (!Array.isArray(findings)) return [];
  return findings.flatMap((f: { message?: unknown; caution?: unknown }) =>
    typeof f.message === "string" ? [{ message: f.message, caution: typeof f.caution === "string" ? f.caution : "" }] : [],
  );
}

export default async function FlagPage({ params }: Params) {
  const { flagId } = await params;
  const [found, user] = await Promise.all([flagById(flagId), currentUser()]);
  if (!found) notFound();
  const messages = await messagesOfFlag(found.id);
  const figures = valueAgainstBound(found);
  const findings = findingsOf(found.detail);

  return (
    <>
      <PageTitle
        kicker={
          <Link href="/flags" className="hover:underline">
            Flag
          </Link>
        }
        title={
          <>
            {kindTitle(found.kind)} on <span className="font-mono">{found.serial}</span>
          </>
        }
        actions={<FlagStateBadge state={found.state} />}
      />
      <div className="space-y-6">
        {found.kind === "safety-danger" ? <SafetyCautions compact /> : null}
        <Panel>
          <p className="mb-4 text-sm">{found.summary}</p>
          <Facts
            items={[
              {
                label: "Cell",
                value: (
                  <Link href={cellHealthHref(found.serial)} className="font-mono text-copper-dark underline-offset-2 hover:underline">
                    {found.serial}
                  </Link>
                ),
              },
              {
                label: "Batch",
                value: found.batchId ? (
                  <Link href={batchHref(found.batchId)} className="text-copper-dark underline-offset-2 hover:underline">
                    {found.lotCode}
                  </Link>
                ) : (
                  "—"
                ),
              },
              { label: "Rule", value: found.ruleDescription ?? `Raised by hand by ${found.raisedByName ?? "an engineer"}` },
              { label: "Value", value: figures ?? "—" },
              {
                label: "Evidence",
                value: found.evidence ? (
                  <Link href={runHref(found.evidence.runId)} className="text-copper-dark underline-offset-2 hover:underline">
                    {found.evidence.fileName}, analysis {found.evidence.version}
                  </Link>
                ) : (
                  "—"
                ),
              },
              { label: "Opened", value: formatDateTime(found.createdAt) },
              { label: "Cell status", value: found.cellStatus },
            ]}
          />
          {findings.length ? (
            <ul className="mt-4 list-disc space-y-1 pl-5 text-sm">
              {findings.map((f, i) => (
                <li key={i}>
                  {f.message}
                  {f.caution ? <span className="block text-xs text-ink-soft">{f.caution}</span> : null}
                </li>
              ))}
            </ul>
          ) : null}
        </Panel>
        <div className="grid gap-6 lg:grid-cols-[1fr_24rem]">
          <section aria-labelledby="flag-history-title" className="space-y-3">
            <h2 id="flag-history-title" className="text-base font-semibold">
              History
            </h2>
            <FlagHistoryTable transitions={found.transitions} caption="Every step of this flag" />
            {messages.length ? (
              <>
                <h2 className="pt-3 text-base font-semibold">Alert mail</h2>
                <SimpleTable caption="Alert mail sent for this flag" headers={headersOf("To", "Status", "Attempts#", "Last error")} boxed>
                  {messages.map((m) => (
                    <tr key={m.id}>
                      <td className={cellClass()}>{m.toAddress}</td>
                      <td className={cellClass()}>{m.status === "sent" && m.sentAt ? `sent ${formatDateTime(m.sentAt)}` : m.status === "pending" ? `waiting, next try ${formatDateTime(m.nextAttemptAt)}` : m.status}</td>
                      <td className={cellClass(true)}>{m.attempts}</td>
                      <td className={cellClass()}>{m.lastError ?? "—"}</td>
                    </tr>
                  ))}
                </SimpleTable>
              </>
            ) : null}
          </section>
          {user && can(user.role, "flag.transition") && !isClosed(found.state) ? (
            <TransitionForm flagId={found.id} state={found.state} />
          ) : (
            <Panel title="Next step">
              <p className="text-sm text-ink-soft">{isClosed(found.state) ? "This flag is closed: new evidence opens a new flag." : "Engineers move flags; this one waits for them."}</p>
            </Panel>
          )}
        </div>
      </div>
    </>
  );
}
