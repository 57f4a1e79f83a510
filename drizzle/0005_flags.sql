CREATE TYPE "public"."flag_rule_kind" AS ENUM('soh-below', 'fade-outlier', 'ce-below', 'dcir-rise', 'safety-danger');--> statement-breakpoint
CREATE TYPE "public"."flag_state" AS ENUM('open', 'acknowledged', 'retest requested', 'cleared', 'cell retired');--> statement-breakpoint
CREATE TYPE "public"."outbox_status" AS ENUM('pending', 'sent', 'failed');--> statement-breakpoint
CREATE TABLE "flag" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"cell_id" uuid NOT NULL,
	"rule_id" uuid,
	"kind" text NOT NULL,
	"state" "flag_state" DEFAULT 'open' NOT NULL,
	"summary" text NOT NULL,
	"value" double precision,
	"bound" double precision,
	"unit" text,
	"evidence_analysis_id" uuid,
	"detail" jsonb,
	"raised_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "flag_rule" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"kind" "flag_rule_kind" NOT NULL,
	"bound" double precision,
	"enabled" boolean DEFAULT true NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_by" text,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "flag_transition" (
	"id" bigint PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "flag_transition_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 9223372036854775807 START WITH 1 CACHE 1),
	"flag_id" uuid NOT NULL,
	"from_state" "flag_state",
	"to_state" "flag_state" NOT NULL,
	"reason" text NOT NULL,
	"actor_id" text,
	"actor_name" text NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "lab_settings" (
	"id" integer PRIMARY KEY DEFAULT 1 NOT NULL,
	"eol_threshold_pct" double precision DEFAULT 80 NOT NULL,
	"digest_enabled" boolean DEFAULT false NOT NULL,
	"digest_hour" integer DEFAULT 7 NOT NULL,
	"last_digest_on" date,
	"updated_by" text,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "lot_decision" (
	"id" bigint PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "lot_decision_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 9223372036854775807 START WITH 1 CACHE 1),
	"batch_id" uuid NOT NULL,
	"from_disposition" "batch_disposition" NOT NULL,
	"disposition" "batch_disposition" NOT NULL,
	"reason" text NOT NULL,
	"figures" jsonb,
	"decided_by" text,
	"decided_by_name" text NOT NULL,
	"decided_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "outbox_message" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"kind" text NOT NULL,
	"to_address" text NOT NULL,
	"subject" text NOT NULL,
	"text_body" text NOT NULL,
	"html_body" text,
	"flag_id" uuid,
	"status" "outbox_status" DEFAULT 'pending' NOT NULL,
	"attempts" integer DEFAULT 0 NOT NULL,
	"next_attempt_at" timestamp with time zone DEFAULT now() NOT NULL,
	"last_error" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"sent_at" timestamp with time zone
);
--> statement-breakpoint
ALTER TABLE "flag" ADD CONSTRAINT "flag_cell_id_cell_id_fk" FOREIGN KEY ("cell_id") REFERENCES "public"."cell"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "flag" ADD CONSTRAINT "flag_rule_id_flag_rule_id_fk" FOREIGN KEY ("rule_id") REFERENCES "public"."flag_rule"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "flag" ADD CONSTRAINT "flag_evidence_analysis_id_analysis_version_id_fk" FOREIGN KEY ("evidence_analysis_id") REFERENCES "public"."analysis_version"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "flag" ADD CONSTRAINT "flag_raised_by_user_id_fk" FOREIGN KEY ("raised_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "flag_rule" ADD CONSTRAINT "flag_rule_created_by_user_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "flag_rule" ADD CONSTRAINT "flag_rule_updated_by_user_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "flag_transition" ADD CONSTRAINT "flag_transition_flag_id_flag_id_fk" FOREIGN KEY ("flag_id") REFERENCES "public"."flag"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "flag_transition" ADD CONSTRAINT "flag_transition_actor_id_user_id_fk" FOREIGN KEY ("actor_id") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lab_settings" ADD CONSTRAINT "lab_settings_updated_by_user_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lot_decision" ADD CONSTRAINT "lot_decision_batch_id_batch_id_fk" FOREIGN KEY ("batch_id") REFERENCES "public"."batch"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lot_decision" ADD CONSTRAINT "lot_decision_decided_by_user_id_fk" FOREIGN KEY ("decided_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "outbox_message" ADD CONSTRAINT "outbox_message_flag_id_flag_id_fk" FOREIGN KEY ("flag_id") REFERENCES "public"."flag"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "flag_cell_idx" ON "flag" USING btree ("cell_id");--> statement-breakpoint
CREATE INDEX "flag_state_created_idx" ON "flag" USING btree ("state","created_at");--> statement-breakpoint
CREATE UNIQUE INDEX "flag_rule_cell_evidence_unique" ON "flag" USING btree ("rule_id","cell_id","evidence_analysis_id") WHERE "flag"."rule_id" is not null;--> statement-breakpoint
CREATE UNIQUE INDEX "flag_rule_cell_unclosed_unique" ON "flag" USING btree ("rule_id","cell_id") WHERE "flag"."rule_id" is not null and "flag"."state" in ('open', 'acknowledged', 'retest requested');--> statement-breakpoint
CREATE INDEX "flag_transition_flag_idx" ON "flag_transition" USING btree ("flag_id","at");--> statement-breakpoint
CREATE INDEX "lot_decision_batch_idx" ON "lot_decision" USING btree ("batch_id","decided_at");--> statement-breakpoint
CREATE INDEX "outbox_status_next_idx" ON "outbox_message" USING btree ("status","next_attempt_at");--> statement-breakpoint
-- A flag's history and the lot decisions are records: the database refuses to change or remove them.
CREATE FUNCTION flag_record_refuse_change() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION '% rows are append-only: % refused', TG_TABLE_NAME, TG_OP
    USING ERRCODE = 'insufficient_privilege';
END;
$$;
--> statement-breakpoint
CREATE TRIGGER flag_transition_append_only
  BEFORE UPDATE OR DELETE ON "flag_transition"
  FOR EACH ROW EXECUTE FUNCTION flag_record_refuse_change();
--> statement-breakpoint
CREATE TRIGGER lot_decision_append_only
  BEFORE UPDATE OR DELETE ON "lot_decision"
  FOR EACH ROW EXECUTE FUNCTION flag_record_refuse_change();
--> statement-breakpoint
-- The rules a new lab starts with; engineers change bounds or switch them off on the rules page.
INSERT INTO "flag_rule" ("kind", "bound", "note") VALUES
  ('soh-below', NULL, 'Uses the end-of-life threshold setting.'),
  ('fade-outlier', 0.05, ''),
  ('ce-below', 98, ''),
  ('dcir-rise', 50, ''),
  ('safety-danger', NULL, '');
