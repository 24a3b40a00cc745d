CREATE TABLE "species_display_names" (
	"species_id" integer PRIMARY KEY NOT NULL,
	"name" text NOT NULL
);
--> statement-breakpoint
ALTER TABLE "species_display_names" ADD CONSTRAINT "species_display_names_species_id_species_id_fk" FOREIGN KEY ("species_id") REFERENCES "public"."species"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "dataset_versions_participant_names_idx" ON "dataset_versions" USING gin ("participant_names" jsonb_path_ops);--> statement-breakpoint
-- Backfill: the most used name of each species among public versions (lib/search/documents.ts writeSpeciesDisplayNames states the same rule).
INSERT INTO "species_display_names" ("species_id", "name")
SELECT DISTINCT ON (sid) sid, name FROM (
	SELECT (e->>'speciesId')::int AS sid, e->>'name' AS name, count(*) AS uses
	FROM "dataset_versions" v, jsonb_array_elements(v."participant_names") e
	WHERE v."state" IN ('published', 'retracted') AND coalesce(e->>'name', '') <> ''
	GROUP BY 1, 2) x
WHERE EXISTS (SELECT 1 FROM "species" s WHERE s."id" = x.sid)
ORDER BY sid, uses DESC, lower(name), name;
