-- A counter of changes to search_documents, for the PostgreSQL engine's in-memory index
-- (lib/search/engines/memory-index.ts): it reloads the listed documents when the number moved.
-- Bumped by a statement trigger in the transaction of the change, so the new number is never seen
-- before the rows it counts (a sequence would be: nextval is not transactional).
CREATE TABLE "search_generation" (
	"id" boolean PRIMARY KEY DEFAULT true NOT NULL CHECK ("id"),
	"generation" bigint NOT NULL
);
--> statement-breakpoint
INSERT INTO "search_generation" ("id", "generation") VALUES (true, 1);
--> statement-breakpoint
CREATE FUNCTION arrhenia_search_generation_bump() RETURNS trigger
  LANGUAGE plpgsql SET search_path = pg_catalog, public, pg_temp AS $$
BEGIN
  UPDATE search_generation SET generation = generation + 1;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER search_documents_generation AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON search_documents
  FOR EACH STATEMENT EXECUTE FUNCTION arrhenia_search_generation_bump();
