CREATE TABLE "creator_people" (
	"version_id" integer NOT NULL,
	"position" integer NOT NULL,
	"user_id" integer NOT NULL,
	CONSTRAINT "creator_people_version_id_position_pk" PRIMARY KEY("version_id","position")
);
--> statement-breakpoint
ALTER TABLE "users" ADD COLUMN "verified_orcid" text;--> statement-breakpoint
ALTER TABLE "users" ADD COLUMN "orcid_linked_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "users" ADD COLUMN "password_set" boolean DEFAULT true NOT NULL;--> statement-breakpoint
ALTER TABLE "users" ADD COLUMN "profile_listed" boolean DEFAULT true NOT NULL;--> statement-breakpoint
ALTER TABLE "creator_people" ADD CONSTRAINT "creator_people_version_id_dataset_versions_id_fk" FOREIGN KEY ("version_id") REFERENCES "public"."dataset_versions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "creator_people" ADD CONSTRAINT "creator_people_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "creator_people_user_idx" ON "creator_people" USING btree ("user_id");--> statement-breakpoint
CREATE UNIQUE INDEX "users_verified_orcid_key" ON "users" USING btree ("verified_orcid");--> statement-breakpoint

-- Hand-written below: the triggers that keep creator_people current. A version's creator entry is
-- linked to the account whose verified ORCID iD it names, in the transaction of the change that
-- makes it so: a version's document written (a draft saved, a new version deposited; published
-- documents never change), or an account's verified iD linked or unlinked. Published versions are
-- never written: the link lives in its own table. A link that changes moves the OAI-PMH datestamp
-- of the public versions concerned (their DataCite creators carry the verified iD).
CREATE OR REPLACE FUNCTION arrhenia_version_creator_people() RETURNS trigger AS $$
BEGIN
  DELETE FROM creator_people WHERE version_id = NEW.id;
  INSERT INTO creator_people (version_id, position, user_id)
    SELECT NEW.id, c.ord - 1, u.id
      FROM jsonb_array_elements(CASE WHEN jsonb_typeof(NEW.payload->'creators') = 'array' THEN NEW.payload->'creators' ELSE '[]'::jsonb END)
        WITH ORDINALITY c(entry, ord)
      JOIN users u ON u.verified_orcid = c.entry->>'orcid'
    ON CONFLICT DO NOTHING;
  RETURN NULL;
END;
$$ LANGUAGE plpgsql SECURITY DEFINER SET search_path = pg_catalog, public, pg_temp;
--> statement-breakpoint
REVOKE ALL ON FUNCTION arrhenia_version_creator_people() FROM PUBLIC;
--> statement-breakpoint
CREATE TRIGGER dataset_versions_creator_people
  AFTER INSERT OR UPDATE OF payload ON dataset_versions
  FOR EACH ROW EXECUTE FUNCTION arrhenia_version_creator_people();
--> statement-breakpoint
CREATE OR REPLACE FUNCTION arrhenia_account_creator_people() RETURNS trigger AS $$
DECLARE
  before_link integer[];
BEGIN
  SELECT coalesce(array_agg(version_id), '{}') INTO before_link FROM creator_people WHERE user_id = NEW.id;
  DELETE FROM creator_people WHERE user_id = NEW.id;
  IF NEW.verified_orcid IS NOT NULL THEN
    INSERT INTO creator_people (version_id, position, user_id)
      SELECT v.id, c.ord - 1, NEW.id
        FROM dataset_versions v
        CROSS JOIN LATERAL jsonb_array_elements(v.payload->'creators') WITH ORDINALITY c(entry, ord)
        WHERE jsonb_typeof(v.payload->'creators') = 'array'
          AND v.payload->'creators' @> jsonb_build_array(jsonb_build_object('orcid', NEW.verified_orcid))
          AND c.entry->>'orcid' = NEW.verified_orcid
      ON CONFLICT DO NOTHING;
  END IF;
  UPDATE oai_record_datestamps r SET changed_at = greatest(r.changed_at, now())
    WHERE r.version_id = ANY (before_link) OR r.version_id IN (SELECT version_id FROM creator_people WHERE user_id = NEW.id);
  RETURN NULL;
END;
$$ LANGUAGE plpgsql SECURITY DEFINER SET search_path = pg_catalog, public, pg_temp;
--> statement-breakpoint
REVOKE ALL ON FUNCTION arrhenia_account_creator_people() FROM PUBLIC;
--> statement-breakpoint
CREATE TRIGGER users_creator_people_insert
  AFTER INSERT ON users
  FOR EACH ROW WHEN (NEW.verified_orcid IS NOT NULL) EXECUTE FUNCTION arrhenia_account_creator_people();
--> statement-breakpoint
CREATE TRIGGER users_creator_people_update
  AFTER UPDATE OF verified_orcid ON users
  FOR EACH ROW WHEN (OLD.verified_orcid IS DISTINCT FROM NEW.verified_orcid) EXECUTE FUNCTION arrhenia_account_creator_people();
--> statement-breakpoint

-- DataCite creators now name only verified iDs (from creator_people), no longer a typed-in one:
-- the records of public versions whose documents name an iD change here.
UPDATE oai_record_datestamps r SET changed_at = greatest(r.changed_at, now())
  FROM dataset_versions v
  WHERE v.id = r.version_id AND jsonb_path_exists(v.payload, '$.creators[*].orcid');
