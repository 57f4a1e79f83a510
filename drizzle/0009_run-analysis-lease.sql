ALTER TABLE "run" ADD COLUMN "lease_owner" text;--> statement-breakpoint
ALTER TABLE "run" ADD COLUMN "lease_expires_at" timestamp with time zone;