import "server-only";
import { count } from "drizzle-orm";
import { chemistryPresets } from "@/lib/domain/presets";
import type { Database } from "./client";
import { batch, cell, cellType, user } from "./schema";
import { createUserAccount } from "./queries/users";
import { recordAudit } from "./queries/audit";
import { demoUsers } from "./seed-users";

function presetValues(chemistry: "LiPo" | "NMC" | "LFP") {
  const p = chemistryPresets.find((x) => x.chemistry === chemistry);
  if (!p) throw new Error(`no preset for ${chemistry}`);
  return {
    chemistry,
    nominalVoltageV: p.nominalVoltageV.value,
    chargeVoltageLimitV: p.chargeVoltageLimitV.value,
    dischargeCutoffV: p.dischargeCutoffV.value,
    maxChargeC: p.maxChargeC.value,
    maxDischargeC: p.maxDischargeC.value,
    terminationC: p.terminationC.value,
    chargeTempMinC: p.chargeTempMinC.value,
    chargeTempMaxC: p.chargeTempMaxC.value,
    dischargeTempMinC: p.dischargeTempMinC.value,
    dischargeTempMaxC: p.dischargeTempMaxC.value,
  };
}

const demoCellTypes = [
  { name: "Larkspur P1000 pouch", ratedCapacityMah: 1000, ...presetValues("LiPo"), notes: "Demo: a 1000 mAh polymer pouch for handheld packs." },
  { name: "Larkspur C2500 cylinder", ratedCapacityMah: 2500, ...presetValues("NMC"), maxDischargeC: 4, notes: "Demo: a 2500 mAh cylindrical cell." },
  { name: "Larkspur F1500 phosphate", ratedCapacityMah: 1500, ...presetValues("LFP"), notes: "Demo: a 1500 mAh iron-phosphate cell." },
];

const demoBatches = [
  { lotCode: "P1000-2610-A", type: 0, supplier: "Eastgate Cell Supply (demo)", receivedOn: "2026-10-06", quantity: 24, lsl: 1000, usl: 1150, prefix: "PA" },
  { lotCode: "P1000-2611-B", type: 0, supplier: "Eastgate Cell Supply (demo)", receivedOn: "2026-11-03", quantity: 24, lsl: 1000, usl: 1150, prefix: "PB" },
  { lotCode: "C2500-2611-01", type: 1, supplier: "Harrow Energy Components (demo)", receivedOn: "2026-11-17", quantity: 12, lsl: 2450, usl: null, prefix: "CA" },
];

export interface SeedResult {
  seeded: boolean;
  users: number;
  cells: number;
}

/** Seeds an empty database; does nothing when users exist already (so restarts keep real data). */
export async function seedDemo(db: Database): Promise<SeedResult> {
  const [{ n } = { n: 0 }] = await db.select({ n: count() }).from(user);
  if (n > 0) return { seeded: false, users: n, cells: 0 };

  for (const u of demoUsers) await createUserAccount(u, null);
  let cells = 0;
  await db.transaction(async (tx) => {
    const types = await tx.insert(cellType).values(demoCellTypes).returning({ id: cellType.id });
    for (const b of demoBatches) {
      const typeId = types[b.type]?.id;
      if (!typeId) throw new Error("seed: cell type missing");
      const [row] = await tx
        .insert(batch)
        .values({ lotCode: b.lotCode, cellTypeId: typeId, supplier: b.supplier, receivedOn: b.receivedOn, quantity: b.quantity, capacityLslMah: b.lsl, capacityUslMah: b.usl })
        .returning({ id: batch.id });
      if (!row) throw new Error("seed: batch missing");
      const serials = Array.from({ length: b.quantity }, (_, i) => `${b.prefix}-${String(i + 1).padStart(4, "0")}`);
      const inserted = await tx.insert(cell).values(serials.map((serial) => ({ serial, batchId: row.id, cellTypeId: typeId }))).returning({ id: cell.id, serial: cell.serial });
      cells += inserted.length;
      // Each cell's registration is the first line of its record history, as for cells imported by hand.
      await recordAudit(
        tx,
        null,
        { action: "seed", entity: "batch", entityId: row.id, after: { lotCode: b.lotCode, cells: serials.length } },
        ...inserted.map((c) => ({ action: "import", entity: "cell", entityId: c.id, after: { serial: c.serial, batchId: row.id, lotCode: b.lotCode } })),
      );
    }
  });
  return { seeded: true, users: demoUsers.length, cells };
}
