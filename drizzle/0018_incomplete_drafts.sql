ALTER TABLE "dataset_versions" ADD COLUMN "draft_document" jsonb;--> statement-breakpoint
ALTER TABLE "dataset_versions" ADD COLUMN "draft_problems" jsonb;