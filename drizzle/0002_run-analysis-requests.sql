ALTER TABLE "run" ADD COLUMN "request_seq" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "run" ADD COLUMN "requested_by" text;--> statement-breakpoint
ALTER TABLE "run" ADD CONSTRAINT "run_requested_by_user_id_fk" FOREIGN KEY ("requested_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;