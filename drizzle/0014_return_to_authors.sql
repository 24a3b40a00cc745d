-- A curator's decision to send a version back is "return" (to the authors) and the version's state
-- "returned" (for revision). RENAME VALUE changes the enum's label in the catalogue only: no row of
-- decisions or dataset_versions is rewritten, so no freeze trigger fires and none is relaxed, and
-- every decision already on record (published versions' included) reads with the new word.
ALTER TYPE "public"."decision" RENAME VALUE 'request_changes' TO 'return';--> statement-breakpoint
ALTER TYPE "public"."version_state" RENAME VALUE 'changes_requested' TO 'returned';--> statement-breakpoint
-- The audit trail names transitions and states as text; it keeps the same words as the rows it describes.
UPDATE "audit_events" SET "action" = 'dataset.return' WHERE "action" = 'dataset.request_changes';--> statement-breakpoint
UPDATE "audit_events" SET "details" = jsonb_set("details", '{from}', '"returned"') WHERE "subject_type" = 'dataset_version' AND "details"->>'from' = 'changes_requested';--> statement-breakpoint
UPDATE "audit_events" SET "details" = jsonb_set("details", '{to}', '"returned"') WHERE "subject_type" = 'dataset_version' AND "details"->>'to' = 'changes_requested';
