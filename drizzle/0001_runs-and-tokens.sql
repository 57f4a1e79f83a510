CREATE TYPE "public"."run_purpose" AS ENUM('capacity check', 'cycle life', 'internal resistance', 'formation', 'other');--> statement-breakpoint
CREATE TYPE "public"."run_source" AS ENUM('browser', 'api');--> statement-breakpoint
CREATE TYPE "public"."run_status" AS ENUM('queued', 'analysing', 'complete', 'failed');--> statement-breakpoint
CREATE TABLE "analysis_version" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"run_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"column_map" jsonb NOT NULL,
	"detection" jsonb NOT NULL,
	"report" jsonb NOT NULL,
	"engine_version" text NOT NULL,
	"requested_by" text,
	"charged_mah" double precision,
	"discharged_mah" double precision,
	"coulombic_efficiency" double precision,
	"switch_time_s" double precision,
	"switch_voltage_v" double precision,
	"switch_capacity_mah" double precision,
	"findings_count" integer DEFAULT 0 NOT NULL,
	"safety_findings_count" integer DEFAULT 0 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "api_token" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"owner_id" text NOT NULL,
	"name" text NOT NULL,
	"token_hash" text NOT NULL,
	"prefix" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"last_used_at" timestamp with time zone,
	"revoked_at" timestamp with time zone,
	CONSTRAINT "api_token_token_hash_unique" UNIQUE("token_hash")
);
--> statement-breakpoint
CREATE TABLE "plot_series" (
	"id" bigint PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "plot_series_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 9223372036854775807 START WITH 1 CACHE 1),
	"analysis_id" uuid NOT NULL,
	"trace" text NOT NULL,
	"data" jsonb NOT NULL
);
--> statement-breakpoint
CREATE TABLE "run" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"cell_id" uuid NOT NULL,
	"uploaded_by" text,
	"source" "run_source" NOT NULL,
	"purpose" "run_purpose" NOT NULL,
	"ambient_temp_c" double precision,
	"operator_note" text DEFAULT '' NOT NULL,
	"file_key" text NOT NULL,
	"file_name" text NOT NULL,
	"file_size" bigint NOT NULL,
	"sha256" text NOT NULL,
	"status" "run_status" DEFAULT 'queued' NOT NULL,
	"error" jsonb,
	"requested_column_map" jsonb,
	"attempts" integer DEFAULT 0 NOT NULL,
	"latest_version" integer,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"started_at" timestamp with time zone,
	"finished_at" timestamp with time zone,
	CONSTRAINT "run_file_key_unique" UNIQUE("file_key")
);
--> statement-breakpoint
CREATE TABLE "run_cycle" (
	"id" bigint PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "run_cycle_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 9223372036854775807 START WITH 1 CACHE 1),
	"analysis_id" uuid NOT NULL,
	"cycle" integer NOT NULL,
	"charged_mah" double precision,
	"discharged_mah" double precision,
	"coulombic_efficiency" double precision,
	"switch_time_s" double precision,
	"switch_voltage_v" double precision,
	"switch_capacity_mah" double precision,
	"detail" jsonb NOT NULL
);
--> statement-breakpoint
CREATE TABLE "run_finding" (
	"id" bigint PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "run_finding_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 9223372036854775807 START WITH 1 CACHE 1),
	"analysis_id" uuid NOT NULL,
	"kind" text NOT NULL,
	"severity" text NOT NULL,
	"time_s" double precision NOT NULL,
	"end_s" double precision,
	"line" integer,
	"value" double precision,
	"limit_value" double precision,
	"unit" text,
	"message" text NOT NULL,
	"caution" text DEFAULT '' NOT NULL
);
--> statement-breakpoint
CREATE TABLE "run_step" (
	"id" bigint PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "run_step_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 9223372036854775807 START WITH 1 CACHE 1),
	"analysis_id" uuid NOT NULL,
	"step" integer NOT NULL,
	"cycle" integer,
	"kind" text NOT NULL,
	"start_s" double precision NOT NULL,
	"end_s" double precision NOT NULL,
	"charged_mah" double precision,
	"discharged_mah" double precision,
	"start_voltage_v" double precision,
	"end_voltage_v" double precision,
	"mean_current_a" double precision,
	"detail" jsonb NOT NULL
);
--> statement-breakpoint
CREATE TABLE "saved_column_map" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"owner_id" text NOT NULL,
	"name" text NOT NULL,
	"map" jsonb NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "analysis_version" ADD CONSTRAINT "analysis_version_run_id_run_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."run"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "analysis_version" ADD CONSTRAINT "analysis_version_requested_by_user_id_fk" FOREIGN KEY ("requested_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "api_token" ADD CONSTRAINT "api_token_owner_id_user_id_fk" FOREIGN KEY ("owner_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "plot_series" ADD CONSTRAINT "plot_series_analysis_id_analysis_version_id_fk" FOREIGN KEY ("analysis_id") REFERENCES "public"."analysis_version"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "run" ADD CONSTRAINT "run_cell_id_cell_id_fk" FOREIGN KEY ("cell_id") REFERENCES "public"."cell"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "run" ADD CONSTRAINT "run_uploaded_by_user_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "run_cycle" ADD CONSTRAINT "run_cycle_analysis_id_analysis_version_id_fk" FOREIGN KEY ("analysis_id") REFERENCES "public"."analysis_version"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "run_finding" ADD CONSTRAINT "run_finding_analysis_id_analysis_version_id_fk" FOREIGN KEY ("analysis_id") REFERENCES "public"."analysis_version"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "run_step" ADD CONSTRAINT "run_step_analysis_id_analysis_version_id_fk" FOREIGN KEY ("analysis_id") REFERENCES "public"."analysis_version"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "saved_column_map" ADD CONSTRAINT "saved_column_map_owner_id_user_id_fk" FOREIGN KEY ("owner_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "analysis_version_run_version_unique" ON "analysis_version" USING btree ("run_id","version");--> statement-breakpoint
CREATE INDEX "api_token_owner_idx" ON "api_token" USING btree ("owner_id");--> statement-breakpoint
CREATE UNIQUE INDEX "plot_series_analysis_trace_unique" ON "plot_series" USING btree ("analysis_id","trace");--> statement-breakpoint
CREATE UNIQUE INDEX "run_cell_sha256_unique" ON "run" USING btree ("cell_id","sha256");--> statement-breakpoint
CREATE INDEX "run_cell_created_idx" ON "run" USING btree ("cell_id","created_at");--> statement-breakpoint
CREATE INDEX "run_status_idx" ON "run" USING btree ("status");--> statement-breakpoint
CREATE UNIQUE INDEX "run_cycle_analysis_cycle_unique" ON "run_cycle" USING btree ("analysis_id","cycle");--> statement-breakpoint
CREATE INDEX "run_finding_analysis_idx" ON "run_finding" USING btree ("analysis_id");--> statement-breakpoint
CREATE UNIQUE INDEX "run_step_analysis_step_unique" ON "run_step" USING btree ("analysis_id","step");--> statement-breakpoint
CREATE UNIQUE INDEX "saved_column_map_owner_name_unique" ON "saved_column_map" USING btree ("owner_id",lower("name"));