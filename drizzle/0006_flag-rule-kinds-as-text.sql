ALTER TABLE "flag_rule" ALTER COLUMN "kind" SET DATA TYPE text;--> statement-breakpoint
ALTER TABLE "flag_rule" ADD CONSTRAINT "flag_rule_kind_known" CHECK ("flag_rule"."kind" in ('soh-below', 'fade-rate-above', 'fade-outlier', 'ce-below', 'dcir-rise', 'safety-danger'));--> statement-breakpoint
DROP TYPE "public"."flag_rule_kind";--> statement-breakpoint
-- The fade-rate rule that new labs start with: a cell losing more than 10 % of its rating per 100 cycles.
INSERT INTO "flag_rule" ("kind", "bound", "note") VALUES ('fade-rate-above', 10, '');
