ALTER TABLE "flag_transition" ADD COLUMN "signed_by" text;--> statement-breakpoint
ALTER TABLE "flag_transition" ADD COLUMN "signed_by_name" text;--> statement-breakpoint
ALTER TABLE "flag_transition" ADD COLUMN "signed_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "flag_transition" ADD COLUMN "signature_meaning" text;--> statement-breakpoint
ALTER TABLE "lot_decision" ADD COLUMN "signed_by" text;--> statement-breakpoint
ALTER TABLE "lot_decision" ADD COLUMN "signed_by_name" text;--> statement-breakpoint
ALTER TABLE "lot_decision" ADD COLUMN "signed_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "lot_decision" ADD COLUMN "signature_meaning" text;--> statement-breakpoint
ALTER TABLE "flag_transition" ADD CONSTRAINT "flag_transition_signed_by_user_id_fk" FOREIGN KEY ("signed_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lot_decision" ADD CONSTRAINT "lot_decision_signed_by_user_id_fk" FOREIGN KEY ("signed_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "flag_transition" ADD CONSTRAINT "flag_transition_signature_meaning_known" CHECK ("flag_transition"."signature_meaning" in ('approved', 'rejected', 'reviewed'));--> statement-breakpoint
ALTER TABLE "flag_transition" ADD CONSTRAINT "flag_transition_signature_whole" CHECK (("flag_transition"."signed_by_name" is null) = ("flag_transition"."signed_at" is null) and ("flag_transition"."signed_at" is null) = ("flag_transition"."signature_meaning" is null));--> statement-breakpoint
ALTER TABLE "lot_decision" ADD CONSTRAINT "lot_decision_signature_meaning_known" CHECK ("lot_decision"."signature_meaning" in ('approved', 'rejected', 'reviewed'));--> statement-breakpoint
ALTER TABLE "lot_decision" ADD CONSTRAINT "lot_decision_signature_whole" CHECK (("lot_decision"."signed_by_name" is null) = ("lot_decision"."signed_at" is null) and ("lot_decision"."signed_at" is null) = ("lot_decision"."signature_meaning" is null));