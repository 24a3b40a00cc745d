-- Search documents of the PostgreSQL engine (lib/search). Hand-edited after drizzle-kit generate:
-- the extension and the two immutable helpers the generated columns use come first, the guard last.
-- pg_trgm is a trusted extension: the database owner may create it.
CREATE EXTENSION IF NOT EXISTS pg_trgm;
--> statement-breakpoint
-- The weighted text of one document. English stemming throughout, so the query (websearch_to_tsquery('english', …)) meets it.
-- IMMUTABLE: array_to_string over text[] and to_tsvector with a fixed configuration give the same answer for the same input.
CREATE FUNCTION arrhenia_search_vector(title text, equation text, names text[], formulas text[], keywords text[], creators text[],
    technique text, description text, source text) RETURNS tsvector
  LANGUAGE sql IMMUTABLE PARALLEL SAFE SET search_path = pg_catalog AS $$
  SELECT setweight(to_tsvector('english'::regconfig, coalesce(title, '') || ' ' || coalesce(equation, '') || ' ' || array_to_string(names, ' ') || ' ' || array_to_string(formulas, ' ')), 'A')
      || setweight(to_tsvector('english'::regconfig, array_to_string(keywords, ' ') || ' ' || array_to_string(creators, ' ') || ' ' || coalesce(technique, '')), 'B')
      || setweight(to_tsvector('english'::regconfig, coalesce(description, '') || ' ' || coalesce(source, '')), 'C')
$$;
--> statement-breakpoint
CREATE FUNCTION arrhenia_search_names(names text[], formulas text[], equation text) RETURNS text
  LANGUAGE sql IMMUTABLE PARALLEL SAFE SET search_path = pg_catalog AS $$
  SELECT lower(array_to_string(names, ' ') || ' ' || array_to_string(formulas, ' ') || ' ' || coalesce(equation, ''))
$$;
--> statement-breakpoint
CREATE TABLE "search_documents" (
	"version_id" integer PRIMARY KEY NOT NULL,
	"dataset_id" integer NOT NULL,
	"version_number" integer NOT NULL,
	"latest" boolean NOT NULL,
	"retracted" boolean NOT NULL,
	"version_identifier" text,
	"title" text NOT NULL,
	"description" text NOT NULL,
	"keywords" text[] NOT NULL,
	"creators" text[] NOT NULL,
	"technique" text NOT NULL,
	"source" text NOT NULL,
	"source_year" integer,
	"reaction_id" integer NOT NULL,
	"reaction_key" text NOT NULL,
	"equation" text NOT NULL,
	"reactant_keys" text[] NOT NULL,
	"product_keys" text[] NOT NULL,
	"species_names" text[] NOT NULL,
	"formulas" text[] NOT NULL,
	"reaction_class" text NOT NULL,
	"phase" text NOT NULL,
	"method_category" text NOT NULL,
	"bath_gases" text[] NOT NULL,
	"licence" text NOT NULL,
	"t_min" double precision NOT NULL,
	"t_max" double precision NOT NULL,
	"p_min" double precision,
	"p_max" double precision,
	"point_count" integer NOT NULL,
	"flags" text[] NOT NULL,
	"ea" double precision,
	"a" double precision,
	"a_unit" text,
	"published_at" timestamp with time zone NOT NULL,
	"t_span" double precision GENERATED ALWAYS AS (t_max - t_min) STORED,
	"document" "tsvector" GENERATED ALWAYS AS (arrhenia_search_vector(title, equation, species_names, formulas, keywords, creators, technique, description, source)) STORED NOT NULL,
	"names_text" text GENERATED ALWAYS AS (arrhenia_search_names(species_names, formulas, equation)) STORED NOT NULL
);
--> statement-breakpoint
CREATE TABLE "search_reaction_summaries" (
	"reaction_id" integer PRIMARY KEY NOT NULL,
	"consensus" jsonb,
	"spread" double precision,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "search_documents" ADD CONSTRAINT "search_documents_version_id_dataset_versions_id_fk" FOREIGN KEY ("version_id") REFERENCES "public"."dataset_versions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "search_documents" ADD CONSTRAINT "search_documents_reaction_id_reactions_id_fk" FOREIGN KEY ("reaction_id") REFERENCES "public"."reactions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "search_reaction_summaries" ADD CONSTRAINT "search_reaction_summaries_reaction_id_reactions_id_fk" FOREIGN KEY ("reaction_id") REFERENCES "public"."reactions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "search_documents_dataset_idx" ON "search_documents" USING btree ("dataset_id");--> statement-breakpoint
CREATE INDEX "search_documents_reaction_idx" ON "search_documents" USING btree ("reaction_id");--> statement-breakpoint
CREATE INDEX "search_documents_document_idx" ON "search_documents" USING gin ("document");--> statement-breakpoint
CREATE INDEX "search_documents_names_trgm_idx" ON "search_documents" USING gin ("names_text" gin_trgm_ops);--> statement-breakpoint
CREATE INDEX "search_documents_reactant_keys_idx" ON "search_documents" USING gin ("reactant_keys");--> statement-breakpoint
CREATE INDEX "search_documents_product_keys_idx" ON "search_documents" USING gin ("product_keys");--> statement-breakpoint
CREATE INDEX "search_documents_creators_idx" ON "search_documents" USING gin ("creators");--> statement-breakpoint
CREATE INDEX "search_documents_t_min_idx" ON "search_documents" USING btree ("t_min");--> statement-breakpoint
CREATE INDEX "search_documents_t_max_idx" ON "search_documents" USING btree ("t_max");--> statement-breakpoint
CREATE INDEX "search_documents_p_min_idx" ON "search_documents" USING btree ("p_min");--> statement-breakpoint
CREATE INDEX "search_documents_p_max_idx" ON "search_documents" USING btree ("p_max");--> statement-breakpoint
CREATE INDEX "search_documents_newest_idx" ON "search_documents" USING btree ("published_at" DESC NULLS LAST,"version_id" DESC NULLS LAST) WHERE latest;--> statement-breakpoint
CREATE INDEX "search_documents_points_idx" ON "search_documents" USING btree ("point_count" DESC NULLS LAST,"version_id" DESC NULLS LAST) WHERE latest;--> statement-breakpoint
CREATE INDEX "search_documents_span_idx" ON "search_documents" USING btree ("t_span" DESC NULLS LAST,"version_id" DESC NULLS LAST) WHERE latest;--> statement-breakpoint
-- Only published and retracted versions are ever searchable: a row for any other version is refused,
-- whatever the application does (the runtime role writes these rows in the publishing transaction).
CREATE FUNCTION arrhenia_search_documents_public_only() RETURNS trigger
  LANGUAGE plpgsql SET search_path = pg_catalog, public, pg_temp AS $$
BEGIN
  IF NOT EXISTS (SELECT 1 FROM dataset_versions v WHERE v.id = NEW.version_id AND v.state IN ('published', 'retracted')) THEN
    RAISE EXCEPTION 'search document for version % refused: only published and retracted versions are searchable', NEW.version_id
      USING ERRCODE = 'check_violation';
  END IF;
  RETURN NEW;
END $$;
--> statement-breakpoint
CREATE TRIGGER search_documents_public_only BEFORE INSERT OR UPDATE ON search_documents
  FOR EACH ROW EXECUTE FUNCTION arrhenia_search_documents_public_only();
