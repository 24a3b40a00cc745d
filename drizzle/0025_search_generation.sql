-- The mark of the last change to search_documents, for the PostgreSQL engine's in-memory index
-- (lib/search/engines/memory-index.ts): it reloads the listed documents when the mark moved.
-- Set by a statement trigger in the transaction of the change, so the new number is never seen
-- before the rows it counts (a sequence's would be: nextval is not transactional). The number is
-- the changing transaction's id: never the same twice in the cluster, even for a database dropped
-- and made again, so an index can never take another state for its own.
CREATE TABLE "search_generation" (
	"id" boolean PRIMARY KEY DEFAULT true NOT NULL CHECK ("id"),
	"generation" bigint NOT NULL
);
--> statement-breakpoint
INSERT INTO "search_generation" ("id", "generation") VALUES (true, txid_current());
--> statement-breakpoint
CREATE FUNCTION arrhenia_search_generation_bump() RETURNS trigger
  LANGUAGE plpgsql SET search_path = pg_catalog, public, pg_temp AS $$
BEGIN
  UPDATE search_generation SET generation = txid_current();
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER search_documents_generation AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON search_documents
  FOR EACH STATEMENT EXECUTE FUNCTION arrhenia_search_generation_bump();
