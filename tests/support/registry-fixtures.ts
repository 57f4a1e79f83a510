import { createBatch, createCellType } from "@/lib/db/queries/registry";
import type { AuditActor } from "@/lib/db/queries/audit";

/**
 * A lithium-polymer cell type with the trade's usual limits: 3.7 V nominal, 4.2 V charge limit,
 * 3.0 V empty (common practice, no source); C/20 termination and 0–45 °C charging as in public
 * polymer cell specifications (see /work/shared/notes/domain.md).
 */
export function pouchCellType(name: string) {
  return {
    name,
    chemistry: "LiPo" as const,
    nominalVoltageV: 3.7,
    chargeVoltageLimitV: 4.2,
    dischargeCutoffV: 3.0,
    ratedCapacityMah: 1000,
    maxChargeC: 1,
    maxDischargeC: 2,
    terminationC: 0.05,
    chargeTempMinC: 0,
    chargeTempMaxC: 45,
    dischargeTempMinC: -20,
    dischargeTempMaxC: 60,
    notes: "",
  };
}

/** A cell type and one pending batch of it, made through the registry's own writes. */
export async function cellTypeWithBatch(actor: AuditActor, lotCode: string, options: { receivedOn?: string; quantity?: number } = {}) {
  const { id: cellTypeId } = await createCellType(pouchCellType(`Type for ${lotCode}`), actor);
  const { id: batchId } = await createBatch(
    {
      lotCode,
      cellTypeId,
      supplier: "Invented Cells Ltd",
      receivedOn: options.receivedOn ?? "2026-10-01",
      quantity: options.quantity ?? 10,
      capacityLslMah: 950,
      capacityUslMah: undefined,
      notes: "",
    },
    actor,
  );
  return { cellTypeId, batchId };
}
