import Link from "next/link";
import { Badge, type BadgeTone } from "@/components/ui/badge";
import { buttonClass } from "@/components/ui/button";
import { Panel } from "@/components/ui/panel";
import { cellClass, headersOf, SimpleTable } from "@/components/ui/simple-table";
import { getLabSettings, listFlags } from "@/lib/db/queries/flags";
import { listCellsNearingEndOfLife, listRecentUploadsBy } from "@/lib/db/queries/overview";
import { flagListQuery } from "@/lib/validations/flags";
import { cellHref } from "@/lib/registry/links";
import { Empty, linkClass } from "./start-blocks";

const statusTone: Record<string, BadgeTone> = { queued: "neutral", analysing: "accent", complete: "good", failed: "bad" };

function when(date: Date): string {
  return date.toISOString().slice(0, 16).replace("T", " ");
}

/** Technician: the logs they sent lately and where each one stands. */
export async function RecentUploadsBlock({ userId }: { userId: string }) {
  const uploads = await listRecentUploadsBy(userId);
  return (
    <Panel
      title="Your recent uploads"
      actions={
        <Link href="/upload" className={buttonClass("primary")}>
          Upload logs
        </Link>
      }
    >
      {uploads.length === 0 ? (
        <Empty>
          No uploads yet. Export the log from the supply, load or logger as CSV and drop it on the{" "}
          <Link href="/upload" className={linkClass}>
            Upload
          </Link>{" "}
          page; Kneepoint shows the columns it found before anything is analysed.
        </Empty>
      ) : (
        <SimpleTable caption="Your recent uploads" headers={headersOf("Uploaded", "Cell", "Log", "Purpose", "State", "Delivered#")}>
          {uploads.map((u) => (
            <tr key={u.runId}>
              <td className={cellClass()}>{when(u.createdAt)}</td>
              <td className={cellClass()}>
                <Link href={cellHref(u.serial)} className={`font-mono ${linkClass}`}>
                  {u.serial}
                </Link>
              </td>
              <td className={cellClass()}>
                <Link href={`/runs/${u.runId}`} className={linkClass}>
                  {u.fileName}
                </Link>
              </td>
              <td className={cellClass()}>{u.purpose}</td>
              <td className={cellClass()}>
                <Badge tone={statusTone[u.status] ?? "neutral"}>{u.status}</Badge>
                {u.safetyFindings ? <span className="ml-2 text-xs font-semibold text-danger">{u.safetyFindings} safety</span> : null}
              </td>
              <td className={cellClass(true)}>{u.dischargedMah === null ? "–" : `${u.dischargedMah.toFixed(0)} mAh`}</td>
            </tr>
          ))}
        </SimpleTable>
      )}
    </Panel>
  );
}

/** Engineer: flags that still need someone, newest first. */
export async function OpenFlagsBlock() {
  const flags = await listFlags(flagListQuery.parse({ state: "unclosed", pageSize: 10 }));
  return (
    <Panel
      title={`Flags that need attention (${flags.total})`}
      actions={
        <Link href="/flags" className={buttonClass("plain")}>
          All flags
        </Link>
      }
    >
      {flags.items.length === 0 ? (
        <Empty>
          No open flags. Flags open by themselves when an analysis breaks one of the{" "}
          <Link href="/flags/rules" className={linkClass}>
            rules
          </Link>
          , or when someone raises one on a cell&apos;s health page.
        </Empty>
      ) : (
        <SimpleTable caption="Flags that need attention" headers={headersOf("Cell", "Batch", "What", "State", "Opened")}>
          {flags.items.map((f) => (
            <tr key={f.id}>
              <td className={cellClass()}>
                <Link href={cellHref(f.serial)} className={`font-mono ${linkClass}`}>
                  {f.serial}
                </Link>
              </td>
              <td className={cellClass()}>{f.lotCode ?? "–"}</td>
              <td className={cellClass()}>
                <Link href={`/flags/${f.id}`} className={linkClass}>
                  {f.summary}
                </Link>
              </td>
              <td className={cellClass()}>
                <Badge tone={f.state === "open" ? "bad" : "warn"}>{f.state}</Badge>
              </td>
              <td className={cellClass()}>{when(f.createdAt)}</td>
            </tr>
          ))}
        </SimpleTable>
      )}
    </Panel>
  );
}

/** Engineer: cells whose latest delivered capacity is within five points of end of life, or past it. */
export async function NearingEndOfLifeBlock() {
  const settings = await getLabSettings();
  const eol = settings.eolThresholdPct / 100;
  const cells = await listCellsNearingEndOfLife(eol);
  return (
    <Panel title={`Cells near or past end of life (${settings.eolThresholdPct} % of rated)`}>
      {cells.length === 0 ? (
        <Empty>No tested cell is within five points of end of life. Cells appear here once their runs are analysed.</Empty>
      ) : (
        <SimpleTable caption="Cells near or past end of life" headers={headersOf("Cell", "Batch", "Cell type", "Latest delivered#", "SOH#", "Details")}>
          {cells.map((c) => (
            <tr key={c.serial}>
              <td className={cellClass()}>
                <Link href={cellHref(c.serial)} className={`font-mono ${linkClass}`}>
                  {c.serial}
                </Link>
              </td>
              <td className={cellClass()}>{c.lotCode ?? "–"}</td>
              <td className={cellClass()}>{c.cellTypeName}</td>
              <td className={cellClass(true)}>{c.latestMah.toFixed(0)} mAh</td>
              <td className={cellClass(true)}>
                <span className={c.soh < eol ? "font-semibold text-danger" : "text-warn"}>{(c.soh * 100).toFixed(1)} %</span>
              </td>
              <td className={cellClass()}>
                <Link href={`${cellHref(c.serial)}/health`} className={linkClass}>
                  Fade and projection
                </Link>
              </td>
            </tr>
          ))}
        </SimpleTable>
      )}
    </Panel>
  );
}
