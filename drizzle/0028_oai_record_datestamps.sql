CREATE TABLE "oai_record_datestamps" (
	"version_id" integer PRIMARY KEY NOT NULL,
	"changed_at" timestamp with time zone NOT NULL
);
--> statement-breakpoint
ALTER TABLE "oai_record_datestamps" ADD CONSTRAINT "oai_record_datestamps_version_id_dataset_versions_id_fk" FOREIGN KEY ("version_id") REFERENCES "public"."dataset_versions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "oai_record_datestamps_changed_idx" ON "oai_record_datestamps" USING btree ("changed_at","version_id");--> statement-breakpoint

-- The OAI-PMH datestamp of a version's record (OAI-PMH 2.0 §2.7.1: the date of its creation,
-- modification or deletion), kept in the transaction of every change of a version's state. What a
-- version's record (the DataCite resource of lib/identifiers/register.ts, and Dublin Core read off
-- it) is made of: its own frozen document, title, number and publication time; its retraction; the
-- dataset's series identifier (frozen once minted, drizzle/0007); and the nearest identified
-- versions below and above it (IsNewVersionOf / IsPreviousVersionOf). A version's record therefore
-- changes when it is published, when it is retracted, and when the nearest version below or above
-- it is published. A neighbour's retraction changes nothing (a retracted version keeps its
-- identifier and stays linked), and a retracted version is a deleted record whose datestamp is its
-- retraction: a later publication does not move it.
CREATE OR REPLACE FUNCTION arrhenia_track_oai_datestamp() RETURNS trigger AS $$
BEGIN
  IF NEW.state = 'published' AND OLD.state IS DISTINCT FROM 'published' THEN
    INSERT INTO oai_record_datestamps (version_id, changed_at) VALUES (NEW.id, NEW.published_at)
      ON CONFLICT (version_id) DO UPDATE SET changed_at = greatest(oai_record_datestamps.changed_at, EXCLUDED.changed_at);
    UPDATE oai_record_datestamps r SET changed_at = greatest(r.changed_at, NEW.published_at)
      FROM dataset_versions n
      WHERE r.version_id = n.id AND n.state = 'published' AND n.id IN (
        (SELECT b.id FROM dataset_versions b WHERE b.dataset_id = NEW.dataset_id AND b.number < NEW.number AND b.version_identifier IS NOT NULL
          ORDER BY b.number DESC LIMIT 1),
        (SELECT a.id FROM dataset_versions a WHERE a.dataset_id = NEW.dataset_id AND a.number > NEW.number AND a.version_identifier IS NOT NULL
          ORDER BY a.number LIMIT 1));
  ELSIF NEW.state = 'retracted' AND OLD.state IS DISTINCT FROM 'retracted' THEN
    INSERT INTO oai_record_datestamps (version_id, changed_at) VALUES (NEW.id, coalesce(NEW.retracted_at, now()))
      ON CONFLICT (version_id) DO UPDATE SET changed_at = greatest(oai_record_datestamps.changed_at, EXCLUDED.changed_at);
  END IF;
  RETURN NULL;
END;
$$ LANGUAGE plpgsql SECURITY DEFINER SET search_path = pg_catalog, public, pg_temp;
--> statement-breakpoint
REVOKE ALL ON FUNCTION arrhenia_track_oai_datestamp() FROM PUBLIC;
--> statement-breakpoint
CREATE TRIGGER dataset_versions_oai_datestamp
  AFTER UPDATE OF state ON dataset_versions
  FOR EACH ROW WHEN (OLD.state IS DISTINCT FROM NEW.state) EXECUTE FUNCTION arrhenia_track_oai_datestamp();
--> statement-breakpoint

-- The versions already public, by the same rule: the latest of their publication, their retraction,
-- and the publication of the nearest identified version below or above them while they were not
-- yet retracted.
INSERT INTO oai_record_datestamps (version_id, changed_at)
SELECT id, greatest(published_at, retracted_at,
    CASE WHEN previous_published < coalesce(retracted_at, 'infinity') THEN previous_published END,
    CASE WHEN next_published < coalesce(retracted_at, 'infinity') THEN next_published END)
  FROM (
    SELECT id, published_at, retracted_at,
        lag(published_at) OVER w AS previous_published, lead(published_at) OVER w AS next_published
      FROM dataset_versions
      WHERE version_identifier IS NOT NULL AND state IN ('published', 'retracted')
      WINDOW w AS (PARTITION BY dataset_id ORDER BY number)
  ) public_versions
  WHERE published_at IS NOT NULL
ON CONFLICT (version_id) DO NOTHING;
