import { sql } from "drizzle-orm";
import {
  bigint,
  boolean,
  date,
  doublePrecision,
  index,
  integer,
  jsonb,
  pgEnum,
  pgTable,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from "drizzle-orm/pg-core";

/* ------------------------------------------------------------------------------------------
 * Sign-in tables. Column names follow what better-auth's drizzle adapter expects
 * (core tables plus the admin plugin's role/ban columns and session.impersonatedBy).
 * ---------------------------------------------------------------------------------------- */

export const user = pgTable("user", {
  id: text("id").primaryKey(),
  name: text("name").notNull(),
  email: text("email").notNull().unique(),
  emailVerified: boolean("email_verified").notNull().default(false),
  image: text("image"),
  role: text("role").notNull().default("technician"),
  banned: boolean("banned").default(false),
  banReason: text("ban_reason"),
  banExpires: timestamp("ban_expires", { withTimezone: true }),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
});

export const session = pgTable(
  "session",
  {
    id: text("id").primaryKey(),
    expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
    token: text("token").notNull().unique(),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
    ipAddress: text("ip_address"),
    userAgent: text("user_agent"),
    userId: text("user_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    impersonatedBy: text("impersonated_by"),
  },
  (t) => [index("session_user_idx").on(t.userId)],
);

export const account = pgTable(
  "account",
  {
    id: text("id").primaryKey(),
    accountId: text("account_id").notNull(),
    providerId: text("provider_id").notNull(),
    userId: text("user_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    accessToken: text("access_token"),
    refreshToken: text("refresh_token"),
    idToken: text("id_token"),
    accessTokenExpiresAt: timestamp("access_token_expires_at", { withTimezone: true }),
    refreshTokenExpiresAt: timestamp("refresh_token_expires_at", { withTimezone: true }),
    scope: text("scope"),
    password: text("password"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("account_user_idx").on(t.userId)],
);

export const verification = pgTable("verification", {
  id: text("id").primaryKey(),
  identifier: text("identifier").notNull(),
  value: text("value").notNull(),
  expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
});

/* ------------------------------------------------------------------------------------------
 * Lab registry: cell types, batches (lots) and cells.
 * ---------------------------------------------------------------------------------------- */

export const chemistry = pgEnum("chemistry", ["LCO", "NMC", "LiPo", "LFP", "NiMH", "other"]);
export const batchDisposition = pgEnum("batch_disposition", ["pending", "accepted", "rejected", "on hold"]);
export const cellStatus = pgEnum("cell_status", ["active", "flagged", "retired"]);

export const cellType = pgTable("cell_type", {
  id: uuid("id").primaryKey().defaultRandom(),
  name: text("name").notNull().unique(),
  chemistry: chemistry("chemistry").notNull(),
  nominalVoltageV: doublePrecision("nominal_voltage_v").notNull(),
  chargeVoltageLimitV: doublePrecision("charge_voltage_limit_v").notNull(),
  dischargeCutoffV: doublePrecision("discharge_cutoff_v").notNull(),
  ratedCapacityMah: doublePrecision("rated_capacity_mah").notNull(),
  maxChargeC: doublePrecision("max_charge_c").notNull(),
  maxDischargeC: doublePrecision("max_discharge_c").notNull(),
  /** Termination current of the CV phase as a fraction of 1C (0.05 = C/20). */
  terminationC: doublePrecision("termination_c").notNull(),
  chargeTempMinC: doublePrecision("charge_temp_min_c").notNull(),
  chargeTempMaxC: doublePrecision("charge_temp_max_c").notNull(),
  dischargeTempMinC: doublePrecision("discharge_temp_min_c").notNull(),
  dischargeTempMaxC: doublePrecision("discharge_temp_max_c").notNull(),
  notes: text("notes").notNull().default(""),
  createdBy: text("created_by").references(() => user.id, { onDelete: "set null" }),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
});

export const batch = pgTable(
  "batch",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    lotCode: text("lot_code").notNull().unique(),
    cellTypeId: uuid("cell_type_id")
      .notNull()
      .references(() => cellType.id, { onDelete: "restrict" }),
    supplier: text("supplier").notNull(),
    receivedOn: date("received_on", { mode: "string" }).notNull(),
    quantity: integer("quantity").notNull(),
    /** Lower and upper spec limits on delivered capacity; the upper one is optional (one-sided spec). */
    capacityLslMah: doublePrecision("capacity_lsl_mah").notNull(),
    capacityUslMah: doublePrecision("capacity_usl_mah"),
    disposition: batchDisposition("disposition").notNull().default("pending"),
    notes: text("notes").notNull().default(""),
    createdBy: text("created_by").references(() => user.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("batch_cell_type_idx").on(t.cellTypeId), index("batch_received_idx").on(t.receivedOn)],
);

export const cell = pgTable(
  "cell",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    serial: text("serial").notNull(),
    batchId: uuid("batch_id").references(() => batch.id, { onDelete: "restrict" }),
    cellTypeId: uuid("cell_type_id")
      .notNull()
      .references(() => cellType.id, { onDelete: "restrict" }),
    status: cellStatus("status").notNull().default("active"),
    createdBy: text("created_by").references(() => user.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    // Serials are unique in the lab regardless of case: "kp-0001" and "KP-0001" are the same cell.
    uniqueIndex("cell_serial_unique").on(sql`lower(${t.serial})`),
    index("cell_batch_idx").on(t.batchId),
  ],
);

/* ------------------------------------------------------------------------------------------
 * Audit trail: append-only. Written in the same transaction as the change it records.
 * ---------------------------------------------------------------------------------------- */

export const auditEvent = pgTable(
  "audit_event",
  {
    id: bigint("id", { mode: "number" }).primaryKey().generatedAlwaysAsIdentity(),
    at: timestamp("at", { withTimezone: true }).notNull().defaultNow(),
    actorId: text("actor_id"),
    actorName: text("actor_name"),
    action: text("action").notNull(),
    entity: text("entity").notNull(),
    entityId: text("entity_id").notNull(),
    before: jsonb("before"),
    after: jsonb("after"),
  },
  (t) => [index("audit_entity_idx").on(t.entity, t.entityId), index("audit_at_idx").on(t.at)],
);

export type UserRow = typeof user.$inferSelect;
export type CellTypeRow = typeof cellType.$inferSelect;
export type CellTypeInsert = typeof cellType.$inferInsert;
export type BatchRow = typeof batch.$inferSelect;
export type BatchInsert = typeof batch.$inferInsert;
export type CellRow = typeof cell.$inferSelect;
export type CellInsert = typeof cell.$inferInsert;
export type AuditEventRow = typeof auditEvent.$inferSelect;
