import { sql } from "drizzle-orm";
import {
  type AnyPgColumn,
  bigint,
  boolean,
  check,
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
import { flagRuleKinds, flagStates } from "../flags/vocabulary";
import { runPurposes, runStatuses } from "../validations/runs";
import { signatureMeanings } from "../validations/signature";

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

/* ------------------------------------------------------------------------------------------
 * Runs: one uploaded bench log of one cell, its analyses (versions) and their results.
 * ---------------------------------------------------------------------------------------- */

export const runPurpose = pgEnum("run_purpose", runPurposes);
export const runStatus = pgEnum("run_status", runStatuses);
export const runSource = pgEnum("run_source", ["browser", "api"]);

/** What a failed run keeps: the engine's located error, or a runner problem without a location. */
export interface RunError {
  code: string;
  message: string;
  line?: number;
  column?: number;
  file?: string;
}

export const run = pgTable(
  "run",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    cellId: uuid("cell_id")
      .notNull()
      .references(() => cell.id, { onDelete: "restrict" }),
    uploadedBy: text("uploaded_by").references(() => user.id, { onDelete: "set null" }),
    source: runSource("source").notNull(),
    purpose: runPurpose("purpose").notNull(),
    ambientTempC: doublePrecision("ambient_temp_c"),
    operatorNote: text("operator_note").notNull().default(""),
    /** The raw file in the upload service; never changed after upload. */
    fileKey: text("file_key").notNull().unique(),
    fileName: text("file_name").notNull(),
    fileSize: bigint("file_size", { mode: "number" }).notNull(),
    /** SHA-256 (hex) of the raw bytes, computed by us while streaming them. */
    sha256: text("sha256").notNull(),
    status: runStatus("status").notNull().default("queued"),
    error: jsonb("error").$type<RunError>(),
    /** The column map the pending (or last) analysis uses; null means detection decides. Survives a restart. */
    requestedColumnMap: jsonb("requested_column_map"),
    /** Bumped by every analysis request; a result whose request was overtaken is stored and the newer request runs next. */
    requestSeq: integer("request_seq").notNull().default(0),
    /** Who asked for the pending (or last) analysis. */
    requestedBy: text("requested_by").references(() => user.id, { onDelete: "set null" }),
    /**
     * The process analysing the run, and until when its claim holds without a renewal. Several app
     * processes on one PostgreSQL server take over only runs whose lease has run out.
     */
    leaseOwner: text("lease_owner"),
    leaseExpiresAt: timestamp("lease_expires_at", { withTimezone: true }),
    /** Analyses started for the current request; a run that keeps crashing the worker is failed, not retried forever. */
    attempts: integer("attempts").notNull().default(0),
    /** Highest analysis version stored; null until the first analysis completes. */
    latestVersion: integer("latest_version"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    /**
     * When the test ended, as the uploader states it; null means "just before the upload".
     * Logs are often uploaded days after the bench finished, and fade by date needs the test's time.
     */
    testEndedAt: timestamp("test_ended_at", { withTimezone: true }),
    startedAt: timestamp("started_at", { withTimezone: true }),
    finishedAt: timestamp("finished_at", { withTimezone: true }),
  },
  (t) => [
    // A byte-identical file can be stored once per cell: the second upload is refused.
    uniqueIndex("run_cell_sha256_unique").on(t.cellId, t.sha256),
    index("run_cell_created_idx").on(t.cellId, t.createdAt),
    index("run_status_idx").on(t.status),
  ],
);

export const analysisVersion = pgTable(
  "analysis_version",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    runId: uuid("run_id")
      .notNull()
      .references(() => run.id, { onDelete: "cascade" }),
    version: integer("version").notNull(),
    /** The column map the reader applied (the effective one, detection included). */
    columnMap: jsonb("column_map").notNull(),
    detection: jsonb("detection").notNull(),
    /** The whole report in the CLI's JSON shape. */
    report: jsonb("report").notNull(),
    engineVersion: text("engine_version").notNull(),
    requestedBy: text("requested_by").references(() => user.id, { onDelete: "set null" }),
    // Key numbers, copied out of the report so a cell's run list needs no JSON digging.
    chargedMah: doublePrecision("charged_mah"),
    dischargedMah: doublePrecision("discharged_mah"),
    coulombicEfficiency: doublePrecision("coulombic_efficiency"),
    switchTimeS: doublePrecision("switch_time_s"),
    switchVoltageV: doublePrecision("switch_voltage_v"),
    switchCapacityMah: doublePrecision("switch_capacity_mah"),
    findingsCount: integer("findings_count").notNull().default(0),
    safetyFindingsCount: integer("safety_findings_count").notNull().default(0),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("analysis_version_run_version_unique").on(t.runId, t.version)],
);

export const runStep = pgTable(
  "run_step",
  {
    id: bigint("id", { mode: "number" }).primaryKey().generatedAlwaysAsIdentity(),
    analysisId: uuid("analysis_id")
      .notNull()
      .references(() => analysisVersion.id, { onDelete: "cascade" }),
    step: integer("step").notNull(),
    cycle: integer("cycle"),
    kind: text("kind").notNull(),
    startS: doublePrecision("start_s").notNull(),
    endS: doublePrecision("end_s").notNull(),
    chargedMah: doublePrecision("charged_mah"),
    dischargedMah: doublePrecision("discharged_mah"),
    startVoltageV: doublePrecision("start_voltage_v"),
    endVoltageV: doublePrecision("end_voltage_v"),
    meanCurrentA: doublePrecision("mean_current_a"),
    /** The step as the report has it (every field). */
    detail: jsonb("detail").notNull(),
  },
  (t) => [uniqueIndex("run_step_analysis_step_unique").on(t.analysisId, t.step)],
);

export const runCycle = pgTable(
  "run_cycle",
  {
    id: bigint("id", { mode: "number" }).primaryKey().generatedAlwaysAsIdentity(),
    analysisId: uuid("analysis_id")
      .notNull()
      .references(() => analysisVersion.id, { onDelete: "cascade" }),
    cycle: integer("cycle").notNull(),
    chargedMah: doublePrecision("charged_mah"),
    dischargedMah: doublePrecision("discharged_mah"),
    coulombicEfficiency: doublePrecision("coulombic_efficiency"),
    switchTimeS: doublePrecision("switch_time_s"),
    switchVoltageV: doublePrecision("switch_voltage_v"),
    switchCapacityMah: doublePrecision("switch_capacity_mah"),
    detail: jsonb("detail").notNull(),
  },
  (t) => [uniqueIndex("run_cycle_analysis_cycle_unique").on(t.analysisId, t.cycle)],
);

export const runFinding = pgTable(
  "run_finding",
  {
    id: bigint("id", { mode: "number" }).primaryKey().generatedAlwaysAsIdentity(),
    analysisId: uuid("analysis_id")
      .notNull()
      .references(() => analysisVersion.id, { onDelete: "cascade" }),
    kind: text("kind").notNull(),
    severity: text("severity").notNull(),
    timeS: doublePrecision("time_s").notNull(),
    endS: doublePrecision("end_s"),
    line: integer("line"),
    value: doublePrecision("value"),
    limitValue: doublePrecision("limit_value"),
    unit: text("unit"),
    message: text("message").notNull(),
    caution: text("caution").notNull().default(""),
  },
  (t) => [index("run_finding_analysis_idx").on(t.analysisId)],
);

/** Downsampled plot data, one row per trace, persisted at analysis time. */
export const plotSeries = pgTable(
  "plot_series",
  {
    id: bigint("id", { mode: "number" }).primaryKey().generatedAlwaysAsIdentity(),
    analysisId: uuid("analysis_id")
      .notNull()
      .references(() => analysisVersion.id, { onDelete: "cascade" }),
    trace: text("trace").notNull(),
    data: jsonb("data").notNull(),
  },
  (t) => [uniqueIndex("plot_series_analysis_trace_unique").on(t.analysisId, t.trace)],
);

/** A named column map a user saved from the upload page's correction. */
export const savedColumnMap = pgTable(
  "saved_column_map",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    ownerId: text("owner_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    map: jsonb("map").notNull(),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("saved_column_map_owner_name_unique").on(t.ownerId, sql`lower(${t.name})`)],
);

/** Personal API tokens for the bench API. Only the SHA-256 of a token is stored. */
export const apiToken = pgTable(
  "api_token",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    ownerId: text("owner_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    tokenHash: text("token_hash").notNull().unique(),
    /** The first characters of the token, to tell tokens apart on the settings page. */
    prefix: text("prefix").notNull(),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    lastUsedAt: timestamp("last_used_at", { withTimezone: true }),
    revokedAt: timestamp("revoked_at", { withTimezone: true }),
  },
  (t) => [index("api_token_owner_idx").on(t.ownerId)],
);

export type RunRow = typeof run.$inferSelect;
export type AnalysisVersionRow = typeof analysisVersion.$inferSelect;

/**
 * Notes on a run: append-only, like a paper notebook. A correction is a new note that `amends` an
 * earlier one; the original stays as it was written (a database trigger refuses UPDATE and DELETE).
 */
export const runNote = pgTable(
  "run_note",
  {
    id: bigint("id", { mode: "number" }).primaryKey().generatedAlwaysAsIdentity(),
    runId: uuid("run_id")
      .notNull()
      .references(() => run.id, { onDelete: "restrict" }),
    authorId: text("author_id").references(() => user.id),
    /** The author's name when the note was written, so the note reads the same after a rename. */
    authorName: text("author_name").notNull(),
    at: timestamp("at", { withTimezone: true }).notNull().defaultNow(),
    text: text("text").notNull(),
    amends: bigint("amends", { mode: "number" }).references((): AnyPgColumn => runNote.id, { onDelete: "restrict" }),
  },
  (t) => [index("run_note_run_at_idx").on(t.runId, t.at), index("run_note_amends_idx").on(t.amends)],
);

export type RunNoteRow = typeof runNote.$inferSelect;

/* ------------------------------------------------------------------------------------------
 * Flags, alerts and lot decisions.
 * ---------------------------------------------------------------------------------------- */

export const flagState = pgEnum("flag_state", flagStates);
export const outboxStatus = pgEnum("outbox_status", ["pending", "sent", "failed"]);

/**
 * A rule engineers configure. `bound` is in the unit the kind names (percent for state of health,
 * fade rate, coulombic efficiency and resistance rise; the test level α for the fade outlier); a null bound on
 * the state-of-health rule means the lab's end-of-life threshold setting.
 */
export const flagRule = pgTable(
  "flag_rule",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    // Text with a check rather than an enum: a new kind then needs no ALTER TYPE, which cannot be used in the migration that adds it.
    kind: text("kind", { enum: flagRuleKinds }).notNull(),
    bound: doublePrecision("bound"),
    enabled: boolean("enabled").notNull().default(true),
    note: text("note").notNull().default(""),
    createdBy: text("created_by").references(() => user.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    updatedBy: text("updated_by").references(() => user.id, { onDelete: "set null" }),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [check("flag_rule_kind_known", sql`${t.kind} in (${sql.raw(flagRuleKinds.map((k) => `'${k}'`).join(", "))})`)],
);

/**
 * An electronic signature on a record (21 CFR 11.50: the signer's printed name, the date and time,
 * and the meaning). The name is the one shown at signing, kept when the account is renamed or
 * removed. Nullable because only some records are signed; which ones must be is enforced in code.
 */
function signatureColumns() {
  return {
    signedBy: text("signed_by").references(() => user.id, { onDelete: "set null" }),
    signedByName: text("signed_by_name"),
    signedAt: timestamp("signed_at", { withTimezone: true }),
    signatureMeaning: text("signature_meaning", { enum: signatureMeanings }),
  };
}

/** A signature is whole or absent: never a meaning without a name and a time. */
function signatureChecks(table: string, t: { signedByName: AnyPgColumn; signedAt: AnyPgColumn; signatureMeaning: AnyPgColumn }) {
  return [
    check(`${table}_signature_meaning_known`, sql`${t.signatureMeaning} in (${sql.raw(signatureMeanings.map((m) => `'${m}'`).join(", "))})`),
    check(
      `${table}_signature_whole`,
      sql`(${t.signedByName} is null) = (${t.signedAt} is null) and (${t.signedAt} is null) = (${t.signatureMeaning} is null)`,
    ),
  ];
}

/** A flag on one cell: opened by a rule on some evidence (an analysis), or raised by hand with a reason. */
export const flag = pgTable(
  "flag",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    cellId: uuid("cell_id")
      .notNull()
      .references(() => cell.id, { onDelete: "restrict" }),
    /** Null for a flag raised by hand. */
    ruleId: uuid("rule_id").references(() => flagRule.id, { onDelete: "restrict" }),
    /** The rule's kind when it opened, or "by hand". */
    kind: text("kind").notNull(),
    state: flagState("state").notNull().default("open"),
    summary: text("summary").notNull(),
    value: doublePrecision("value"),
    bound: doublePrecision("bound"),
    unit: text("unit"),
    /** The analysis whose numbers opened the flag. */
    evidenceAnalysisId: uuid("evidence_analysis_id").references(() => analysisVersion.id, { onDelete: "set null" }),
    detail: jsonb("detail"),
    raisedBy: text("raised_by").references(() => user.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index("flag_cell_idx").on(t.cellId),
    index("flag_state_created_idx").on(t.state, t.createdAt),
    // A rule flags a cell once per piece of evidence: a cleared flag stays cleared for the analysis it was raised on.
    uniqueIndex("flag_rule_cell_evidence_unique").on(t.ruleId, t.cellId, t.evidenceAnalysisId).where(sql`${t.ruleId} is not null`),
    // At most one unclosed flag per rule and cell, even when two evaluations race.
    uniqueIndex("flag_rule_cell_unclosed_unique")
      .on(t.ruleId, t.cellId)
      .where(sql`${t.ruleId} is not null and ${t.state} in ('open', 'acknowledged', 'retest requested')`),
  ],
);

/** Every step of a flag: who, when, why. Append-only (a database trigger refuses changes). */
export const flagTransition = pgTable(
  "flag_transition",
  {
    id: bigint("id", { mode: "number" }).primaryKey().generatedAlwaysAsIdentity(),
    flagId: uuid("flag_id")
      .notNull()
      .references(() => flag.id, { onDelete: "restrict" }),
    /** Null for the step that opened the flag. */
    fromState: flagState("from_state"),
    toState: flagState("to_state").notNull(),
    reason: text("reason").notNull(),
    /** Null when the app itself acted (a rule opened the flag). */
    actorId: text("actor_id").references(() => user.id, { onDelete: "set null" }),
    actorName: text("actor_name").notNull(),
    at: timestamp("at", { withTimezone: true }).notNull().defaultNow(),
    /** Set on the step that clears the flag. */
    ...signatureColumns(),
  },
  (t) => [index("flag_transition_flag_idx").on(t.flagId, t.at), ...signatureChecks("flag_transition", t)],
);

/** The lab's settings for fade and alerts: a single row (id 1); defaults apply until it is saved. */
export const labSettings = pgTable("lab_settings", {
  id: integer("id").primaryKey().default(1),
  eolThresholdPct: doublePrecision("eol_threshold_pct").notNull().default(80),
  digestEnabled: boolean("digest_enabled").notNull().default(false),
  /** Hour of the day (server clock, 0–23) after which the daily digest goes out. */
  digestHour: integer("digest_hour").notNull().default(7),
  /** The server-clock date of the last digest sent, so one goes out per day. */
  lastDigestOn: date("last_digest_on", { mode: "string" }),
  updatedBy: text("updated_by").references(() => user.id, { onDelete: "set null" }),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
});

/** Mail waiting to go out, written in the transaction of the event that causes it; one row per recipient. */
export const outboxMessage = pgTable(
  "outbox_message",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    kind: text("kind").notNull(),
    toAddress: text("to_address").notNull(),
    subject: text("subject").notNull(),
    textBody: text("text_body").notNull(),
    htmlBody: text("html_body"),
    flagId: uuid("flag_id").references(() => flag.id, { onDelete: "set null" }),
    status: outboxStatus("status").notNull().default("pending"),
    attempts: integer("attempts").notNull().default(0),
    nextAttemptAt: timestamp("next_attempt_at", { withTimezone: true }).notNull().defaultNow(),
    lastError: text("last_error"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    sentAt: timestamp("sent_at", { withTimezone: true }),
  },
  (t) => [index("outbox_status_next_idx").on(t.status, t.nextAttemptAt)],
);

/** A QA lead's decision on a lot, with the figures in view when it was made. Append-only. */
export const lotDecision = pgTable(
  "lot_decision",
  {
    id: bigint("id", { mode: "number" }).primaryKey().generatedAlwaysAsIdentity(),
    batchId: uuid("batch_id")
      .notNull()
      .references(() => batch.id, { onDelete: "restrict" }),
    fromDisposition: batchDisposition("from_disposition").notNull(),
    disposition: batchDisposition("disposition").notNull(),
    reason: text("reason").notNull(),
    /** The capability figures computed on the server at the moment of the decision. */
    figures: jsonb("figures"),
    decidedBy: text("decided_by").references(() => user.id, { onDelete: "set null" }),
    decidedByName: text("decided_by_name").notNull(),
    decidedAt: timestamp("decided_at", { withTimezone: true }).notNull().defaultNow(),
    /** Every decision since signatures came in is signed; older rows have none. */
    ...signatureColumns(),
  },
  (t) => [index("lot_decision_batch_idx").on(t.batchId, t.decidedAt), ...signatureChecks("lot_decision", t)],
);

export type FlagRuleRow = typeof flagRule.$inferSelect;
export type FlagRow = typeof flag.$inferSelect;
export type OutboxMessageRow = typeof outboxMessage.$inferSelect;
