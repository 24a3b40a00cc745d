CREATE TYPE "public"."mechanism_check_state" AS ENUM('queued', 'running', 'done', 'failed');--> statement-breakpoint
CREATE TABLE "mechanism_checks" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "mechanism_checks_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"owner_id" integer NOT NULL,
	"state" "mechanism_check_state" DEFAULT 'queued' NOT NULL,
	"name" text NOT NULL,
	"source" text NOT NULL,
	"window_tmin" double precision NOT NULL,
	"window_tmax" double precision NOT NULL,
	"progress" integer DEFAULT 0 NOT NULL,
	"total" integer DEFAULT 0 NOT NULL,
	"attempts" integer DEFAULT 0 NOT NULL,
	"heartbeat_at" timestamp with time zone,
	"share_token" text,
	"report" jsonb,
	"error" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"finished_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "species_mapping_choices" (
	"user_id" integer NOT NULL,
	"name" text NOT NULL,
	"species_id" integer NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "species_mapping_choices_user_id_name_pk" PRIMARY KEY("user_id","name")
);
--> statement-breakpoint
ALTER TABLE "mechanism_checks" ADD CONSTRAINT "mechanism_checks_owner_id_users_id_fk" FOREIGN KEY ("owner_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "species_mapping_choices" ADD CONSTRAINT "species_mapping_choices_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "species_mapping_choices" ADD CONSTRAINT "species_mapping_choices_species_id_species_id_fk" FOREIGN KEY ("species_id") REFERENCES "public"."species"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "mechanism_checks_owner_idx" ON "mechanism_checks" USING btree ("owner_id","created_at");--> statement-breakpoint
CREATE INDEX "mechanism_checks_state_idx" ON "mechanism_checks" USING btree ("state","heartbeat_at");