import type { Metadata } from "next";
import Link from "next/link";
import { DevInboxLink } from "@/components/health/dev-inbox-link";
import { Badge } from "@/components/ui/badge";
import { Facts } from "@/components/ui/facts";
import { PageTitle, Panel } from "@/components/ui/panel";
import { can } from "@/lib/auth/roles";
import { currentUser } from "@/lib/auth/session";
import { getLabSettings, listRules } from "@/lib/db/queries/flags";
import { outboxCounts } from "@/lib/db/queries/outbox";
import { ruleKindInfo } from "@/lib/flags/vocabulary";
import { ensureOutboxSender } from "@/lib/mail/sender";
import { formatDateTime } from "@/lib/notebook/format";
import { RuleForm } from "./_components/rule-form";
import { SettingsForm } from "./_components/settings-form";

export const metadata: Metadata = { title: "Flag rules and settings" };

export default async function FlagRulesPage() {
  const [user, rules, settings, mail] = await Promise.all([currentUser(), listRules(), getLabSettings(), outboxCounts()]);
  ensureOutboxSender();
  const editable = Boolean(user && can(user.role, "flag.rule.write"));
  return (
    <>
      <PageTitle
        kicker={
          <Link href="/flags" className="hover:underline">
            Flags
          </Link>
        }
        title="Rules and settings"
        actions={user ? <DevInboxLink role={user.role} /> : null}
      />
      <div className="space-y-6">
        <p className="max-w-3xl text-sm text-ink-soft">
          Every enabled rule runs after each analysis and on every cell when the rule or a setting changes. A rule flags a cell once for each piece of evidence: a cleared flag stays cleared until a new analysis finds the cell out of bounds again. Every active engineer gets a mail when a flag opens.
        </p>
        <div className="grid gap-6 lg:grid-cols-2">
          {rules.map((rule) => (
            <Panel
              key={rule.id}
              title={rule.description}
              actions={
                <span className="flex gap-2">
                  <Badge tone={rule.enabled ? "good" : "neutral"}>{rule.enabled ? "on" : "off"}</Badge>
                  {rule.unclosedFlags ? <Badge tone="warn">{rule.unclosedFlags} not closed</Badge> : null}
                </span>
              }
            >
              <p className="mb-3 text-sm text-ink-soft">{ruleKindInfo[rule.kind].explanation}</p>
              {rule.note ? <p className="mb-3 text-sm">Note: {rule.note}</p> : null}
              <p className="mb-3 text-xs text-ink-soft">
                Last changed {formatDateTime(rule.updatedAt)}
                {rule.updatedByName ? ` by ${rule.updatedByName}` : ""}
              </p>
              {editable ? <RuleForm rule={{ id: rule.id, kind: rule.kind, bound: rule.bound, enabled: rule.enabled, note: rule.note }} /> : null}
            </Panel>
          ))}
        </div>
        <div className="grid gap-6 lg:grid-cols-2">
          {editable ? (
            <Panel title="Add a rule">
              <RuleForm />
            </Panel>
          ) : null}
          <Panel title="Lab settings">
            {editable ? (
              <SettingsForm settings={settings} />
            ) : (
              <Facts
                items={[
                  { label: "End-of-life threshold", value: `${settings.eolThresholdPct} % of rated` },
                  { label: "Daily digest", value: settings.digestEnabled ? `after ${settings.digestHour}:00` : "off" },
                ]}
              />
            )}
            <p className="mt-4 text-xs text-ink-soft">
              Mail outbox: {mail.pending} waiting, {mail.sent} sent, {mail.failed} failed after every retry.
              {settings.updatedAt ? ` Settings last saved ${formatDateTime(settings.updatedAt)}${settings.updatedByName ? ` by ${settings.updatedByName}` : ""}.` : " Defaults apply until the settings are saved."}
            </p>
          </Panel>
        </div>
      </div>
    </>
  );
}
