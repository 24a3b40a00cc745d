CREATE TYPE "public"."collection_version_state" AS ENUM('draft', 'published');--> statement-breakpoint
CREATE TABLE "collection_members" (
	"collection_version_id" integer NOT NULL,
	"version_id" integer NOT NULL,
	"position" integer NOT NULL,
	"note" text,
	"added_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "collection_members_collection_version_id_version_id_pk" PRIMARY KEY("collection_version_id","version_id"),
	CONSTRAINT "collection_members_note_length" CHECK ("collection_members"."note" is null or char_length("collection_members"."note") <= 500)
);
--> statement-breakpoint
CREATE TABLE "collection_versions" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "collection_versions_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"collection_id" integer NOT NULL,
	"number" integer NOT NULL,
	"state" "collection_version_state" DEFAULT 'draft' NOT NULL,
	"title" text NOT NULL,
	"description" text DEFAULT '' NOT NULL,
	"version_identifier" text,
	"published_at" timestamp with time zone,
	"created_by" integer,
	"created_at" timestamp with time zone DEFAULT arrhenia_recorded_at() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT arrhenia_recorded_at() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "collections" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "collections_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"owner_id" integer NOT NULL,
	"series_identifier" text,
	"created_at" timestamp with time zone DEFAULT arrhenia_recorded_at() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "watches" DROP CONSTRAINT "watches_one_subject";--> statement-breakpoint
ALTER TABLE "identifier_registrations" ALTER COLUMN "dataset_id" DROP NOT NULL;--> statement-breakpoint
ALTER TABLE "identifier_registrations" ADD COLUMN "collection_version_id" integer;--> statement-breakpoint
ALTER TABLE "watches" ADD COLUMN "collection_id" integer;--> statement-breakpoint
ALTER TABLE "collection_members" ADD CONSTRAINT "collection_members_collection_version_id_collection_versions_id_fk" FOREIGN KEY ("collection_version_id") REFERENCES "public"."collection_versions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "collection_members" ADD CONSTRAINT "collection_members_version_id_dataset_versions_id_fk" FOREIGN KEY ("version_id") REFERENCES "public"."dataset_versions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "collection_versions" ADD CONSTRAINT "collection_versions_collection_id_collections_id_fk" FOREIGN KEY ("collection_id") REFERENCES "public"."collections"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "collection_versions" ADD CONSTRAINT "collection_versions_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "collections" ADD CONSTRAINT "collections_owner_id_users_id_fk" FOREIGN KEY ("owner_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "collection_members_version_idx" ON "collection_members" USING btree ("version_id");--> statement-breakpoint
CREATE UNIQUE INDEX "collection_versions_number_key" ON "collection_versions" USING btree ("collection_id","number");--> statement-breakpoint
CREATE UNIQUE INDEX "collection_versions_identifier_key" ON "collection_versions" USING btree ("version_identifier");--> statement-breakpoint
CREATE UNIQUE INDEX "collection_versions_one_draft_key" ON "collection_versions" USING btree ("collection_id") WHERE "collection_versions"."state" = 'draft';--> statement-breakpoint
CREATE INDEX "collection_versions_state_idx" ON "collection_versions" USING btree ("state");--> statement-breakpoint
CREATE INDEX "collections_owner_idx" ON "collections" USING btree ("owner_id");--> statement-breakpoint
CREATE UNIQUE INDEX "collections_series_identifier_key" ON "collections" USING btree ("series_identifier");--> statement-breakpoint
ALTER TABLE "identifier_registrations" ADD CONSTRAINT "identifier_registrations_collection_version_id_collection_versions_id_fk" FOREIGN KEY ("collection_version_id") REFERENCES "public"."collection_versions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "watches" ADD CONSTRAINT "watches_collection_id_collections_id_fk" FOREIGN KEY ("collection_id") REFERENCES "public"."collections"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "watches_user_collection_key" ON "watches" USING btree ("user_id","collection_id");--> statement-breakpoint
CREATE INDEX "watches_collection_idx" ON "watches" USING btree ("collection_id");--> statement-breakpoint
ALTER TABLE "identifier_registrations" ADD CONSTRAINT "identifier_registrations_one_subject" CHECK (num_nonnulls("identifier_registrations"."dataset_id", "identifier_registrations"."collection_version_id") = 1);--> statement-breakpoint
ALTER TABLE "watches" ADD CONSTRAINT "watches_one_subject" CHECK (num_nonnulls("watches"."reaction_id", "watches"."species_id", "watches"."dataset_id", "watches"."collection_id") = 1);--> statement-breakpoint

-- Hand-written from here on: the freeze of published collections, as published dataset versions
-- are frozen (0002, 0007). Each guard runs with a fixed search_path (pg_temp last, as 0008).

-- A collection version: inserted as a draft; published only with its identifier (its collection's
-- series, a slash, its number), a publication time and at least one member, every member a
-- published dataset version; once published, never changed or deleted.
CREATE OR REPLACE FUNCTION arrhenia_guard_collection_version() RETURNS trigger AS $$
DECLARE
  series text;
  bad integer;
BEGIN
  IF TG_OP IN ('UPDATE', 'DELETE') AND OLD.state = 'published' THEN
    RAISE EXCEPTION 'collection version % is published and cannot be %', OLD.id,
      CASE WHEN TG_OP = 'DELETE' THEN 'deleted' ELSE 'changed' END USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF TG_OP = 'DELETE' THEN RETURN OLD; END IF;
  IF TG_OP = 'UPDATE' AND (NEW.collection_id IS DISTINCT FROM OLD.collection_id OR NEW.number IS DISTINCT FROM OLD.number
      OR NEW.created_at IS DISTINCT FROM OLD.created_at) THEN
    RAISE EXCEPTION 'collection version %: its collection and number never change', OLD.id USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF NEW.state = 'draft' THEN
    IF NEW.version_identifier IS NOT NULL OR NEW.published_at IS NOT NULL THEN
      RAISE EXCEPTION 'a draft collection version has no identifier or publication time' USING ERRCODE = 'integrity_constraint_violation';
    END IF;
    RETURN NEW;
  END IF;
  IF TG_OP = 'INSERT' THEN
    RAISE EXCEPTION 'a collection version is inserted as a draft and published afterwards' USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  SELECT series_identifier INTO series FROM collections WHERE id = NEW.collection_id;
  IF series IS NULL OR NEW.version_identifier IS DISTINCT FROM series || '/' || NEW.number OR NEW.published_at IS NULL THEN
    RAISE EXCEPTION 'collection version % is published only with its identifier (%/%) and a publication time', NEW.id, series, NEW.number
      USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF NOT EXISTS (SELECT 1 FROM collection_members WHERE collection_version_id = NEW.id) THEN
    RAISE EXCEPTION 'collection version % has no members and cannot be published', NEW.id USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  SELECT m.version_id INTO bad FROM collection_members m JOIN dataset_versions v ON v.id = m.version_id
    WHERE m.collection_version_id = NEW.id AND v.state <> 'published' LIMIT 1;
  IF bad IS NOT NULL THEN
    RAISE EXCEPTION 'collection version %: member version % is not published', NEW.id, bad USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql SET search_path = pg_catalog, public, pg_temp;
--> statement-breakpoint
CREATE TRIGGER collection_versions_frozen_when_published
  BEFORE INSERT OR UPDATE OR DELETE ON collection_versions
  FOR EACH ROW EXECUTE FUNCTION arrhenia_guard_collection_version();
--> statement-breakpoint
CREATE TRIGGER collection_versions_no_truncate
  BEFORE TRUNCATE ON collection_versions
  FOR EACH STATEMENT EXECUTE FUNCTION arrhenia_guard_append_only();
--> statement-breakpoint

-- Members: only of a draft (checked for OLD and NEW, so no row moves into or out of a published
-- collection version), and only published dataset versions.
CREATE OR REPLACE FUNCTION arrhenia_guard_collection_member() RETURNS trigger AS $$
DECLARE
  cstate collection_version_state;
  vstate version_state;
BEGIN
  IF TG_OP IN ('UPDATE', 'DELETE') THEN
    SELECT state INTO cstate FROM collection_versions WHERE id = OLD.collection_version_id;
    IF cstate = 'published' THEN
      RAISE EXCEPTION 'collection version % is published: its members cannot be changed', OLD.collection_version_id
        USING ERRCODE = 'integrity_constraint_violation';
    END IF;
  END IF;
  IF TG_OP = 'DELETE' THEN RETURN OLD; END IF;
  SELECT state INTO cstate FROM collection_versions WHERE id = NEW.collection_version_id;
  IF cstate = 'published' THEN
    RAISE EXCEPTION 'collection version % is published: its members cannot be changed', NEW.collection_version_id
      USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF TG_OP = 'INSERT' OR NEW.version_id IS DISTINCT FROM OLD.version_id THEN
    SELECT state INTO vstate FROM dataset_versions WHERE id = NEW.version_id;
    IF vstate IS DISTINCT FROM 'published' THEN
      RAISE EXCEPTION 'dataset version % is not published and cannot join a collection', NEW.version_id
        USING ERRCODE = 'integrity_constraint_violation';
    END IF;
  END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql SET search_path = pg_catalog, public, pg_temp;
--> statement-breakpoint
CREATE TRIGGER collection_members_frozen_when_published
  BEFORE INSERT OR UPDATE OR DELETE ON collection_members
  FOR EACH ROW EXECUTE FUNCTION arrhenia_guard_collection_member();
--> statement-breakpoint
CREATE TRIGGER collection_members_no_truncate
  BEFORE TRUNCATE ON collection_members
  FOR EACH STATEMENT EXECUTE FUNCTION arrhenia_guard_append_only();
--> statement-breakpoint

-- A collection keeps its series identifier once minted, and its owner and existence once published.
CREATE OR REPLACE FUNCTION arrhenia_guard_collection() RETURNS trigger AS $$
BEGIN
  IF OLD.series_identifier IS NOT NULL AND (TG_OP = 'DELETE' OR NEW.series_identifier IS DISTINCT FROM OLD.series_identifier
      OR NEW.owner_id IS DISTINCT FROM OLD.owner_id) THEN
    RAISE EXCEPTION 'collection % is published: its identifier and owner never change', OLD.id USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF TG_OP = 'DELETE' THEN RETURN OLD; END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql SET search_path = pg_catalog, public, pg_temp;
--> statement-breakpoint
CREATE TRIGGER collections_frozen_when_published
  BEFORE UPDATE OR DELETE ON collections
  FOR EACH ROW EXECUTE FUNCTION arrhenia_guard_collection();
--> statement-breakpoint

-- Identifier registrations (0007): the collection version a registration names never changes either.
CREATE OR REPLACE FUNCTION arrhenia_guard_registration() RETURNS trigger AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN
    RAISE EXCEPTION 'identifier % is minted: its registration cannot be deleted', OLD.identifier USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF NEW.identifier IS DISTINCT FROM OLD.identifier OR NEW.kind IS DISTINCT FROM OLD.kind
     OR NEW.version_id IS DISTINCT FROM OLD.version_id OR NEW.dataset_id IS DISTINCT FROM OLD.dataset_id
     OR NEW.collection_version_id IS DISTINCT FROM OLD.collection_version_id
     OR NEW.created_at IS DISTINCT FROM OLD.created_at
     OR (OLD.registered AND NOT NEW.registered)
     OR (OLD.registered_at IS NOT NULL AND NEW.registered_at IS DISTINCT FROM OLD.registered_at)
     OR NEW.attempts < OLD.attempts THEN
    RAISE EXCEPTION 'identifier % is minted: its registration can only move forward', OLD.identifier USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql SET search_path = pg_catalog, public, pg_temp;
