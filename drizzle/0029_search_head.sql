-- The short part of a search document (weights A and B of arrhenia_search_vector: title, equation,
-- species names and formulas; keywords, creators, technique), without the description and source.
-- A text search ranks its matches by this part first (cheap: it stays in the row, storage main,
-- where the whole document is mostly compressed out of line) and only the best of them by the whole
-- document (lib/search/engines/postgres.ts). Same words and weights as arrhenia_search_vector.
CREATE FUNCTION arrhenia_search_head(title text, equation text, names text[], formulas text[], keywords text[], creators text[],
    technique text) RETURNS tsvector
  LANGUAGE sql IMMUTABLE PARALLEL SAFE SET search_path = pg_catalog AS $$
  SELECT setweight(to_tsvector('english'::regconfig, coalesce(title, '') || ' ' || coalesce(equation, '') || ' ' || array_to_string(names, ' ') || ' ' || array_to_string(formulas, ' ')), 'A')
      || setweight(to_tsvector('english'::regconfig, array_to_string(keywords, ' ') || ' ' || array_to_string(creators, ' ') || ' ' || coalesce(technique, '')), 'B')
$$;
--> statement-breakpoint
-- One statement: the storage is set before the table is rewritten with the new column.
ALTER TABLE "search_documents" ADD COLUMN "head" "tsvector" GENERATED ALWAYS AS (arrhenia_search_head(title, equation, species_names, formulas, keywords, creators, technique)) STORED NOT NULL,
  ALTER COLUMN "head" SET STORAGE MAIN;
