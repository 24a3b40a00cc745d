ALTER TABLE "mechanism_checks" ADD COLUMN "format" text;--> statement-breakpoint
ALTER TABLE "mechanism_checks" ADD COLUMN "stage" text;