CREATE TABLE "run_note" (
	"id" bigint PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "run_note_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 9223372036854775807 START WITH 1 CACHE 1),
	"run_id" uuid NOT NULL,
	"author_id" text,
	"author_name" text NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"text" text NOT NULL,
	"amends" bigint
);
--> statement-breakpoint
ALTER TABLE "run_note" ADD CONSTRAINT "run_note_run_id_run_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."run"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "run_note" ADD CONSTRAINT "run_note_author_id_user_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "run_note" ADD CONSTRAINT "run_note_amends_run_note_id_fk" FOREIGN KEY ("amends") REFERENCES "public"."run_note"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "run_note_run_at_idx" ON "run_note" USING btree ("run_id","at");--> statement-breakpoint
CREATE INDEX "run_note_amends_idx" ON "run_note" USING btree ("amends");--> statement-breakpoint
-- Notes are append-only like the audit trail: a correction is a new note that amends the old one,
-- and the database refuses to change or remove what was written. TRUNCATE (test resets) is left alone.
CREATE FUNCTION run_note_refuse_change() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION 'run notes are append-only: % refused', TG_OP
    USING ERRCODE = 'insufficient_privilege';
END;
$$;
--> statement-breakpoint
CREATE TRIGGER run_note_append_only
  BEFORE UPDATE OR DELETE ON "run_note"
  FOR EACH ROW EXECUTE FUNCTION run_note_refuse_change();
