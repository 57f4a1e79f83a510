import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { Badge, cellStatusTone } from "@/components/ui/badge";
import { Facts } from "@/components/ui/facts";
import { PageTitle, Panel } from "@/components/ui/panel";
import { getCellBySerial, getCellType } from "@/lib/db/queries/registry";
import { formatTermination } from "@/lib/registry/format";
import { batchHref } from "@/lib/registry/links";
import { identifierField } from "@/lib/validations/fields";

type Params = { params: Promise<{ serial: string }> };

const serialParam = identifierField("Serial");

/** Page params arrive still percent-encoded; "%" is not a serial character, so one decode is exact. */
async function serialFrom(params: Params["params"]): Promise<string | null> {
  const { serial } = await params;
  let decoded: string;
  try {
    decoded = decodeURIComponent(serial);
  } catch {
    return null;
  }
  const parsed = serialParam.safeParse(decoded);
  return parsed.success ? parsed.data : null;
}

export async function generateMetadata({ params }: Params): Promise<Metadata> {
  return { title: (await serialFrom(params)) ?? "Cell" };
}

export default async function CellPage({ params }: Params) {
  const serial = await serialFrom(params);
  const cell = serial ? await getCellBySerial(serial) : null;
  if (!cell) notFound();
  const type = await getCellType(cell.cellTypeId);

  return (
    <>
      <PageTitle kicker="Cell" title={<span className="font-mono">{cell.serial}</span>} actions={<Badge tone={cellStatusTone[cell.status]}>{cell.status}</Badge>} />
      <div className="space-y-6">
        <Panel title="Registry">
          <Facts
            items={[
              { label: "Status", value: cell.status },
              {
                label: "Batch",
                value: cell.batchId ? (
                  <Link href={batchHref(cell.batchId)} className="text-copper-dark underline-offset-2 hover:underline">
                    {cell.lotCode}
                  </Link>
                ) : (
                  "No batch (registered on its own)"
                ),
              },
              { label: "Cell type", value: cell.cellTypeName },
              { label: "Registered", value: cell.createdAt.toLocaleDateString("en-CA") },
            ]}
          />
        </Panel>
        {type ? (
          <Panel title={`Limits of ${type.name}`}>
            <Facts
              items={[
                { label: "Rated capacity", value: `${type.ratedCapacityMah} mAh` },
                { label: "Nominal voltage", value: `${type.nominalVoltageV} V` },
                { label: "Charge voltage limit", value: `${type.chargeVoltageLimitV} V` },
                { label: "Discharge cut-off", value: `${type.dischargeCutoffV} V` },
                { label: "Charge C-rate, at most", value: `${type.maxChargeC}C` },
                { label: "Discharge C-rate, at most", value: `${type.maxDischargeC}C` },
                { label: "Charge ends at", value: formatTermination(type.terminationC) },
              ]}
            />
          </Panel>
        ) : null}
        <Panel title="Runs">
          <p className="text-sm text-ink-soft">
            No runs yet. The charge and discharge runs of this cell will appear here once their logs are uploaded.
          </p>
        </Panel>
      </div>
    </>
  );
}
