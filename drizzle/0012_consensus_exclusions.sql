CREATE TABLE "consensus_exclusions" (
	"version_id" integer PRIMARY KEY NOT NULL,
	"reason" text NOT NULL,
	"excluded_by" integer NOT NULL,
	"excluded_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "consensus_exclusions_reason_length" CHECK (char_length("consensus_exclusions"."reason") between 3 and 1000)
);
--> statement-breakpoint
ALTER TABLE "consensus_exclusions" ADD CONSTRAINT "consensus_exclusions_version_id_dataset_versions_id_fk" FOREIGN KEY ("version_id") REFERENCES "public"."dataset_versions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "consensus_exclusions" ADD CONSTRAINT "consensus_exclusions_excluded_by_users_id_fk" FOREIGN KEY ("excluded_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;