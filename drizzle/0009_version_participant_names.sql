-- The names a version's document gives its species belong to that version: public pages show the
-- names of published versions only, so a draft can no longer rename a species for everyone.
ALTER TABLE "dataset_versions" ADD COLUMN "participant_names" jsonb DEFAULT '[]'::jsonb NOT NULL;--> statement-breakpoint
-- Existing versions take the names their document gives, matched to their reaction's species
-- through the names stored so far. The backfill touches published rows once, as the schema owner.
ALTER TABLE "dataset_versions" DISABLE TRIGGER "dataset_versions_frozen_when_published";--> statement-breakpoint
UPDATE "dataset_versions" v SET "participant_names" = coalesce((
  SELECT jsonb_agg(DISTINCT jsonb_build_object('speciesId', rp.species_id, 'name', e->>'name'))
  FROM reaction_participants rp
  JOIN species_names n ON n.species_id = rp.species_id
  CROSS JOIN jsonb_array_elements(coalesce(v.payload->'reaction'->'reactants', '[]'::jsonb) || coalesce(v.payload->'reaction'->'products', '[]'::jsonb)) e
  WHERE rp.reaction_id = v.reaction_id AND lower(n.name) = lower(e->>'name')), '[]'::jsonb)
WHERE v.reaction_id IS NOT NULL;--> statement-breakpoint
ALTER TABLE "dataset_versions" ENABLE TRIGGER "dataset_versions_frozen_when_published";
