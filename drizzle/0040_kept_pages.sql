CREATE TABLE "kept_pages" (
	"key" text PRIMARY KEY NOT NULL,
	"build" text NOT NULL,
	"tags" text[] NOT NULL,
	"rendered_at" bigint NOT NULL,
	"status" integer NOT NULL,
	"headers" jsonb NOT NULL,
	"body" "bytea" NOT NULL,
	"kept_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "page_tag_moves" (
	"tag" text PRIMARY KEY NOT NULL,
	"moved" bigint NOT NULL
);
--> statement-breakpoint
CREATE INDEX "kept_pages_kept_at_idx" ON "kept_pages" USING btree ("kept_at");