-- A key is now recorded in the transaction that creates the thing, with its response. Records of
-- requests that never finished (the old "in flight" state) would refuse their retries: dropped.
DELETE FROM "idempotency_keys" WHERE "response_status" IS NULL OR "response_headers" IS NULL OR "response_body" IS NULL;--> statement-breakpoint
ALTER TABLE "idempotency_keys" ALTER COLUMN "response_status" SET NOT NULL;--> statement-breakpoint
ALTER TABLE "idempotency_keys" ALTER COLUMN "response_headers" SET NOT NULL;--> statement-breakpoint
ALTER TABLE "idempotency_keys" ALTER COLUMN "response_body" SET NOT NULL;