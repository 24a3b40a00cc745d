CREATE TABLE "orcid_sign_ups" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "orcid_sign_ups_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"ticket_id" text NOT NULL,
	"user_id" integer NOT NULL,
	"browser_key_hash" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "orcid_sign_ups" ADD CONSTRAINT "orcid_sign_ups_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "orcid_sign_ups_ticket_key" ON "orcid_sign_ups" USING btree ("ticket_id");--> statement-breakpoint
CREATE INDEX "orcid_sign_ups_user_idx" ON "orcid_sign_ups" USING btree ("user_id","id");