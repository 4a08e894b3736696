CREATE TABLE "user_sessions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"user_id" uuid NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"revoked_at" timestamp with time zone
);
--> statement-breakpoint
ALTER TABLE "mail_messages" ADD COLUMN "link_secret" text;--> statement-breakpoint
ALTER TABLE "user_sessions" ADD CONSTRAINT "user_sessions_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "user_sessions_user_id_created_at_index" ON "user_sessions" USING btree ("user_id","created_at");--> statement-breakpoint
-- Password links already sent were kept in clear in the outbox: take the token out of those bodies.
UPDATE "mail_messages" SET "body" = regexp_replace("body", '/reset-password\?token=[A-Za-z0-9_-]+', '/reset-password?token=(removed after sending)', 'g') WHERE "kind" = 'password_link';
