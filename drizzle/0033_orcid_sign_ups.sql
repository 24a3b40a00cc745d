CREATE TABLE "orcid_sign_ups" (
	"ticket_id" text PRIMARY KEY NOT NULL,
	"user_id" integer NOT NULL,
	"browser_key_hash" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "orcid_sign_ups" ADD CONSTRAINT "orcid_sign_ups_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "orcid_sign_ups_user_idx" ON "orcid_sign_ups" USING btree ("user_id","created_at");