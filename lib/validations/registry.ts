import { z } from "zod";
import { identifierField, isoDateField, numberField, optionalNumberField, optionalTextField, pageQuery, textField } from "./fields";

export const chemistries = ["LCO", "NMC", "LiPo", "LFP", "NiMH", "other"] as const;
export const dispositions = ["pending", "accepted", "rejected", "on hold"] as const;
export const cellStatuses = ["active", "flagged", "retired"] as const;

export const cellTypeInput = z
  .object({
    name: textField("Name", 80),
    chemistry: z.enum(chemistries, { error: "Choose a chemistry" }),
    nominalVoltageV: numberField("Nominal voltage", { gt: 0, max: 10 }),
    chargeVoltageLimitV: numberField("Charge voltage limit", { gt: 0, max: 10 }),
    dischargeCutoffV: numberField("Discharge cut-off", { gt: 0, max: 10 }),
    ratedCapacityMah: numberField("Rated capacity", { gt: 0, max: 1_000_000 }),
    maxChargeC: numberField("Maximum charge C-rate", { gt: 0, max: 100 }),
    maxDischargeC: numberField("Maximum discharge C-rate", { gt: 0, max: 200 }),
    terminationC: numberField("Termination current", { gt: 0, max: 1 }),
    chargeTempMinC: numberField("Lowest charge temperature", { min: -60, max: 100 }),
    chargeTempMaxC: numberField("Highest charge temperature", { min: -60, max: 100 }),
    dischargeTempMinC: numberField("Lowest discharge temperature", { min: -60, max: 100 }),
    dischargeTempMaxC: numberField("Highest discharge temperature", { min: -60, max: 100 }),
    notes: optionalTextField("Notes", 2000),
  })
  .superRefine((v, ctx) => {
    if (v.dischargeCutoffV >= v.nominalVoltageV)
      ctx.addIssue({ code: "custom", path: ["dischargeCutoffV"], message: "Discharge cut-off must be below the nominal voltage" });
    if (v.chargeVoltageLimitV <= v.nominalVoltageV)
      ctx.addIssue({ code: "custom", path: ["chargeVoltageLimitV"], message: "Charge voltage limit must be above the nominal voltage" });
    if (v.chargeTempMinC >= v.chargeTempMaxC)
      ctx.addIssue({ code: "custom", path: ["chargeTempMaxC"], message: "Highest charge temperature must be above the lowest" });
    if (v.dischargeTempMinC >= v.dischargeTempMaxC)
      ctx.addIssue({ code: "custom", path: ["dischargeTempMaxC"], message: "Highest discharge temperature must be above the lowest" });
  });
export type CellTypeInput = z.output<typeof cellTypeInput>;

export const batchInput = z
  .object({
    lotCode: identifierField("Lot code"),
    cellTypeId: z.uuid({ error: "Choose a cell type" }),
    supplier: textField("Supplier", 120),
    receivedOn: isoDateField("Received date"),
    quantity: numberField("Quantity", { min: 1, max: 1_000_000 }).pipe(z.number().int("Quantity must be a whole number")),
    capacityLslMah: numberField("Lower capacity limit", { gt: 0, max: 1_000_000 }),
    capacityUslMah: optionalNumberField("Upper capacity limit", { gt: 0, max: 1_000_000 }),
    notes: optionalTextField("Notes", 2000),
  })
  .superRefine((v, ctx) => {
    if (v.capacityUslMah !== undefined && v.capacityUslMah <= v.capacityLslMah)
      ctx.addIssue({ code: "custom", path: ["capacityUslMah"], message: "Upper limit must be above the lower limit" });
  });
export type BatchInput = z.output<typeof batchInput>;

export const cellInput = z.object({
  serial: identifierField("Serial"),
  batchId: z.preprocess((v) => (v === "" ? undefined : v), z.uuid({ error: "Choose a batch" }).optional()),
  cellTypeId: z.preprocess((v) => (v === "" ? undefined : v), z.uuid({ error: "Choose a cell type" }).optional()),
});
export type CellInput = z.output<typeof cellInput>;

export const serialImportInput = z.object({
  batchId: z.uuid({ error: "Choose a batch" }),
  serials: z.array(identifierField("Serial")).min(1, "The list has no serials").max(10_000, "At most 10,000 serials per import"),
});

export const batchListQuery = z.object({
  ...pageQuery,
  sort: z.enum(["lotCode", "receivedOn", "supplier", "quantity", "disposition", "cellType"]).default("receivedOn"),
  dir: z.enum(["asc", "desc"]).default("desc"),
  disposition: z.enum(dispositions).optional(),
  cellTypeId: z.uuid().optional(),
});
export type BatchListQuery = z.output<typeof batchListQuery>;

export const cellListQuery = z.object({
  ...pageQuery,
  sort: z.enum(["serial", "status", "lotCode", "cellType", "createdAt"]).default("serial"),
  dir: z.enum(["asc", "desc"]).default("asc"),
  status: z.enum(cellStatuses).optional(),
  batchId: z.uuid().optional(),
});
export type CellListQuery = z.output<typeof cellListQuery>;
