CREATE TYPE "public"."reaction_side" AS ENUM('reactant', 'product');--> statement-breakpoint
CREATE TYPE "public"."co_editor_role" AS ENUM('owner', 'editor', 'viewer');--> statement-breakpoint
CREATE TYPE "public"."decision" AS ENUM('accept', 'request_changes', 'decline');--> statement-breakpoint
CREATE TYPE "public"."version_state" AS ENUM('draft', 'submitted', 'in_review', 'changes_requested', 'published', 'declined', 'retracted');--> statement-breakpoint
CREATE TABLE "reaction_participants" (
	"reaction_id" integer NOT NULL,
	"species_id" integer NOT NULL,
	"side" "reaction_side" NOT NULL,
	"coefficient" integer NOT NULL,
	CONSTRAINT "reaction_participants_reaction_id_species_id_side_pk" PRIMARY KEY("reaction_id","species_id","side")
);
--> statement-breakpoint
CREATE TABLE "reactions" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "reactions_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"key" text NOT NULL,
	"equation" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "species" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "species_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"inchi_key" text NOT NULL,
	"inchi" text NOT NULL,
	"canonical_smiles" text NOT NULL,
	"formula" text NOT NULL,
	"charge" integer DEFAULT 0 NOT NULL,
	"molar_mass" real NOT NULL,
	"radical_electrons" integer DEFAULT 0 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "species_names" (
	"species_id" integer NOT NULL,
	"name" text NOT NULL
);
--> statement-breakpoint
CREATE TABLE "dataset_invitations" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "dataset_invitations_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"dataset_id" integer NOT NULL,
	"email" text NOT NULL,
	"role" "co_editor_role" NOT NULL,
	"token_hash" text NOT NULL,
	"invited_by" integer NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	"accepted_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "dataset_members" (
	"dataset_id" integer NOT NULL,
	"user_id" integer NOT NULL,
	"role" "co_editor_role" NOT NULL,
	"added_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "dataset_members_dataset_id_user_id_pk" PRIMARY KEY("dataset_id","user_id")
);
--> statement-breakpoint
CREATE TABLE "dataset_versions" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "dataset_versions_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"dataset_id" integer NOT NULL,
	"number" integer NOT NULL,
	"state" "version_state" DEFAULT 'draft' NOT NULL,
	"title" text NOT NULL,
	"payload" jsonb NOT NULL,
	"lock_version" integer DEFAULT 1 NOT NULL,
	"payload_sha256" text,
	"version_identifier" text,
	"worst_flag" text,
	"flag_codes" text[],
	"t_min" double precision,
	"t_max" double precision,
	"point_count" integer DEFAULT 0 NOT NULL,
	"created_by" integer,
	"submitted_at" timestamp with time zone,
	"published_at" timestamp with time zone,
	"retracted_at" timestamp with time zone,
	"retraction_notice" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "datasets" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "datasets_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"owner_id" integer NOT NULL,
	"reaction_id" integer,
	"series_identifier" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "decisions" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "decisions_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"version_id" integer NOT NULL,
	"curator_id" integer NOT NULL,
	"decision" "decision" NOT NULL,
	"reason" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "identifier_registrations" (
	"identifier" text PRIMARY KEY NOT NULL,
	"kind" text NOT NULL,
	"version_id" integer,
	"dataset_id" integer NOT NULL,
	"registered" boolean DEFAULT false NOT NULL,
	"attempts" integer DEFAULT 0 NOT NULL,
	"last_error" text,
	"registered_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "version_analyses" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "version_analyses_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"version_id" integer NOT NULL,
	"engine_version" text NOT NULL,
	"result" jsonb,
	"checks" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"error" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "version_files" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "version_files_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"version_id" integer NOT NULL,
	"filename" text NOT NULL,
	"content_type" text NOT NULL,
	"size_bytes" bigint NOT NULL,
	"sha256" text NOT NULL,
	"storage_key" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "version_points" (
	"version_id" integer NOT NULL,
	"idx" integer NOT NULL,
	"temperature_k" double precision NOT NULL,
	"rate_constant" double precision NOT NULL,
	"sigma_ln_k" double precision,
	"pressure_pa" double precision,
	"bath_gas" text,
	"note" text,
	"original" jsonb NOT NULL,
	CONSTRAINT "version_points_version_id_idx_pk" PRIMARY KEY("version_id","idx")
);
--> statement-breakpoint
ALTER TABLE "reaction_participants" ADD CONSTRAINT "reaction_participants_reaction_id_reactions_id_fk" FOREIGN KEY ("reaction_id") REFERENCES "public"."reactions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reaction_participants" ADD CONSTRAINT "reaction_participants_species_id_species_id_fk" FOREIGN KEY ("species_id") REFERENCES "public"."species"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "species_names" ADD CONSTRAINT "species_names_species_id_species_id_fk" FOREIGN KEY ("species_id") REFERENCES "public"."species"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dataset_invitations" ADD CONSTRAINT "dataset_invitations_dataset_id_datasets_id_fk" FOREIGN KEY ("dataset_id") REFERENCES "public"."datasets"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dataset_invitations" ADD CONSTRAINT "dataset_invitations_invited_by_users_id_fk" FOREIGN KEY ("invited_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dataset_members" ADD CONSTRAINT "dataset_members_dataset_id_datasets_id_fk" FOREIGN KEY ("dataset_id") REFERENCES "public"."datasets"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dataset_members" ADD CONSTRAINT "dataset_members_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dataset_versions" ADD CONSTRAINT "dataset_versions_dataset_id_datasets_id_fk" FOREIGN KEY ("dataset_id") REFERENCES "public"."datasets"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dataset_versions" ADD CONSTRAINT "dataset_versions_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "datasets" ADD CONSTRAINT "datasets_owner_id_users_id_fk" FOREIGN KEY ("owner_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "datasets" ADD CONSTRAINT "datasets_reaction_id_reactions_id_fk" FOREIGN KEY ("reaction_id") REFERENCES "public"."reactions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "decisions" ADD CONSTRAINT "decisions_version_id_dataset_versions_id_fk" FOREIGN KEY ("version_id") REFERENCES "public"."dataset_versions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "decisions" ADD CONSTRAINT "decisions_curator_id_users_id_fk" FOREIGN KEY ("curator_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "identifier_registrations" ADD CONSTRAINT "identifier_registrations_version_id_dataset_versions_id_fk" FOREIGN KEY ("version_id") REFERENCES "public"."dataset_versions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "identifier_registrations" ADD CONSTRAINT "identifier_registrations_dataset_id_datasets_id_fk" FOREIGN KEY ("dataset_id") REFERENCES "public"."datasets"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "version_analyses" ADD CONSTRAINT "version_analyses_version_id_dataset_versions_id_fk" FOREIGN KEY ("version_id") REFERENCES "public"."dataset_versions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "version_files" ADD CONSTRAINT "version_files_version_id_dataset_versions_id_fk" FOREIGN KEY ("version_id") REFERENCES "public"."dataset_versions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "version_points" ADD CONSTRAINT "version_points_version_id_dataset_versions_id_fk" FOREIGN KEY ("version_id") REFERENCES "public"."dataset_versions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "reactions_key_key" ON "reactions" USING btree ("key");--> statement-breakpoint
CREATE UNIQUE INDEX "species_inchi_key_key" ON "species" USING btree ("inchi_key");--> statement-breakpoint
CREATE UNIQUE INDEX "species_names_key" ON "species_names" USING btree ("species_id",lower("name"));--> statement-breakpoint
CREATE INDEX "species_names_name_idx" ON "species_names" USING btree (lower("name"));--> statement-breakpoint
CREATE UNIQUE INDEX "dataset_invitations_hash_key" ON "dataset_invitations" USING btree ("token_hash");--> statement-breakpoint
CREATE INDEX "dataset_members_user_idx" ON "dataset_members" USING btree ("user_id");--> statement-breakpoint
CREATE UNIQUE INDEX "dataset_versions_number_key" ON "dataset_versions" USING btree ("dataset_id","number");--> statement-breakpoint
CREATE UNIQUE INDEX "dataset_versions_identifier_key" ON "dataset_versions" USING btree ("version_identifier");--> statement-breakpoint
CREATE INDEX "dataset_versions_state_idx" ON "dataset_versions" USING btree ("state");--> statement-breakpoint
CREATE INDEX "datasets_owner_idx" ON "datasets" USING btree ("owner_id");--> statement-breakpoint
CREATE INDEX "datasets_reaction_idx" ON "datasets" USING btree ("reaction_id");--> statement-breakpoint
CREATE UNIQUE INDEX "datasets_series_identifier_key" ON "datasets" USING btree ("series_identifier");--> statement-breakpoint
CREATE INDEX "decisions_version_idx" ON "decisions" USING btree ("version_id");--> statement-breakpoint
CREATE INDEX "identifier_registrations_pending_idx" ON "identifier_registrations" USING btree ("registered");--> statement-breakpoint
CREATE INDEX "version_analyses_version_idx" ON "version_analyses" USING btree ("version_id","created_at");--> statement-breakpoint
CREATE INDEX "version_files_version_idx" ON "version_files" USING btree ("version_id");