-- Slashes separate words in search documents: PostgreSQL's parser reads "RRKM/master equation" as one
-- file-path token, so neither "RRKM" nor "master" was found. The two weighted texts take their words
-- through translate (a slash or backslash becomes a space), as the query does
-- (lib/search/engines/postgres.ts tsQuery); the documents that hold one are then written again so that
-- their generated columns are computed anew. Same weights and parts as drizzle/0022 and 0029.
CREATE OR REPLACE FUNCTION arrhenia_search_vector(title text, equation text, names text[], formulas text[], keywords text[], creators text[],
    technique text, description text, source text) RETURNS tsvector
  LANGUAGE sql IMMUTABLE PARALLEL SAFE SET search_path = pg_catalog AS $$
  SELECT setweight(to_tsvector('english'::regconfig, translate(coalesce(title, '') || ' ' || coalesce(equation, '') || ' ' || array_to_string(names, ' ') || ' ' || array_to_string(formulas, ' '), '/\', '  ')), 'A')
      || setweight(to_tsvector('english'::regconfig, translate(array_to_string(keywords, ' ') || ' ' || array_to_string(creators, ' ') || ' ' || coalesce(technique, ''), '/\', '  ')), 'B')
      || setweight(to_tsvector('english'::regconfig, translate(coalesce(description, '') || ' ' || coalesce(source, ''), '/\', '  ')), 'C')
$$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION arrhenia_search_head(title text, equation text, names text[], formulas text[], keywords text[], creators text[],
    technique text) RETURNS tsvector
  LANGUAGE sql IMMUTABLE PARALLEL SAFE SET search_path = pg_catalog AS $$
  SELECT setweight(to_tsvector('english'::regconfig, translate(coalesce(title, '') || ' ' || coalesce(equation, '') || ' ' || array_to_string(names, ' ') || ' ' || array_to_string(formulas, ' '), '/\', '  ')), 'A')
      || setweight(to_tsvector('english'::regconfig, translate(array_to_string(keywords, ' ') || ' ' || array_to_string(creators, ' ') || ' ' || coalesce(technique, ''), '/\', '  ')), 'B')
$$;
--> statement-breakpoint
UPDATE search_documents SET technique = technique
WHERE concat_ws(' ', title, equation, technique, description, source, array_to_string(keywords, ' '), array_to_string(creators, ' '),
  array_to_string(species_names, ' '), array_to_string(formulas, ' ')) ~ '[/\\]';
