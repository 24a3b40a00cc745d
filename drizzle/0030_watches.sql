CREATE TABLE "watch_notices" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "watch_notices_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"user_id" integer NOT NULL,
	"version_id" integer NOT NULL,
	"event" text NOT NULL,
	"event_at" timestamp with time zone NOT NULL,
	"reasons" jsonb NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"mailed_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "watch_settings" (
	"user_id" integer PRIMARY KEY NOT NULL,
	"daily_digest" boolean DEFAULT false NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "watches" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "watches_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"user_id" integer NOT NULL,
	"reaction_id" integer,
	"species_id" integer,
	"dataset_id" integer,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "watches_one_subject" CHECK (num_nonnulls("watches"."reaction_id", "watches"."species_id", "watches"."dataset_id") = 1)
);
--> statement-breakpoint
ALTER TABLE "watch_notices" ADD CONSTRAINT "watch_notices_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "watch_notices" ADD CONSTRAINT "watch_notices_version_id_dataset_versions_id_fk" FOREIGN KEY ("version_id") REFERENCES "public"."dataset_versions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "watch_settings" ADD CONSTRAINT "watch_settings_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "watches" ADD CONSTRAINT "watches_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "watches" ADD CONSTRAINT "watches_reaction_id_reactions_id_fk" FOREIGN KEY ("reaction_id") REFERENCES "public"."reactions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "watches" ADD CONSTRAINT "watches_species_id_species_id_fk" FOREIGN KEY ("species_id") REFERENCES "public"."species"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "watches" ADD CONSTRAINT "watches_dataset_id_datasets_id_fk" FOREIGN KEY ("dataset_id") REFERENCES "public"."datasets"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "watch_notices_once_key" ON "watch_notices" USING btree ("user_id","version_id","event","event_at");--> statement-breakpoint
CREATE INDEX "watch_notices_waiting_idx" ON "watch_notices" USING btree ("user_id") WHERE "watch_notices"."mailed_at" is null;--> statement-breakpoint
CREATE UNIQUE INDEX "watches_user_reaction_key" ON "watches" USING btree ("user_id","reaction_id");--> statement-breakpoint
CREATE UNIQUE INDEX "watches_user_species_key" ON "watches" USING btree ("user_id","species_id");--> statement-breakpoint
CREATE UNIQUE INDEX "watches_user_dataset_key" ON "watches" USING btree ("user_id","dataset_id");--> statement-breakpoint
CREATE INDEX "watches_reaction_idx" ON "watches" USING btree ("reaction_id");--> statement-breakpoint
CREATE INDEX "watches_species_idx" ON "watches" USING btree ("species_id");--> statement-breakpoint
CREATE INDEX "watches_dataset_idx" ON "watches" USING btree ("dataset_id");