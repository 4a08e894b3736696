ALTER TABLE "obligations" ADD COLUMN "detail_words" jsonb;--> statement-breakpoint
-- every obligation's detail words come from the rule module: recompute the read models at the next start or set-up
INSERT INTO "read_model_rebuilds" ("id", "needed", "reason") VALUES (1, true, '0019: obligations carry their detail as words')
  ON CONFLICT ("id") DO UPDATE SET "needed" = true, "reason" = EXCLUDED."reason", "requested_at" = now();
