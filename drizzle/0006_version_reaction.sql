-- The reaction belongs to each version, not to the dataset: saving the next draft must never move
-- a published version to another reaction. Existing versions take the dataset's reaction.
ALTER TABLE "dataset_versions" ADD COLUMN "reaction_id" integer;--> statement-breakpoint
ALTER TABLE "dataset_versions" ADD CONSTRAINT "dataset_versions_reaction_id_reactions_id_fk" FOREIGN KEY ("reaction_id") REFERENCES "public"."reactions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "dataset_versions_reaction_idx" ON "dataset_versions" USING btree ("reaction_id");--> statement-breakpoint
-- The backfill touches published rows once, as the schema owner, inside the migration's transaction.
ALTER TABLE "dataset_versions" DISABLE TRIGGER "dataset_versions_frozen_when_published";--> statement-breakpoint
UPDATE "dataset_versions" v SET "reaction_id" = d."reaction_id" FROM "datasets" d WHERE d."id" = v."dataset_id";--> statement-breakpoint
ALTER TABLE "dataset_versions" ENABLE TRIGGER "dataset_versions_frozen_when_published";--> statement-breakpoint
ALTER TABLE "datasets" DROP CONSTRAINT "datasets_reaction_id_reactions_id_fk";--> statement-breakpoint
DROP INDEX "datasets_reaction_idx";--> statement-breakpoint
ALTER TABLE "datasets" DROP COLUMN "reaction_id";
