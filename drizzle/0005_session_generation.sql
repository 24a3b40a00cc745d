ALTER TYPE "public"."one_time_purpose" ADD VALUE 'unlock_sign_in';--> statement-breakpoint
ALTER TABLE "users" ADD COLUMN "session_generation" integer DEFAULT 0 NOT NULL;