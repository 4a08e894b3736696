CREATE TYPE "public"."job_status" AS ENUM('running', 'done', 'failed');--> statement-breakpoint
CREATE TABLE "background_jobs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"kind" text NOT NULL,
	"site_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"status" "job_status" DEFAULT 'running' NOT NULL,
	"done" integer DEFAULT 0 NOT NULL,
	"total" integer NOT NULL,
	"input" jsonb,
	"result" jsonb,
	"message" text,
	"attempt" integer DEFAULT 0 NOT NULL,
	"ran_on" text,
	"started_at" timestamp with time zone,
	"finished_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "background_jobs" ADD CONSTRAINT "background_jobs_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "background_jobs" ADD CONSTRAINT "background_jobs_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "background_jobs_user_id_created_at_index" ON "background_jobs" USING btree ("user_id","created_at");--> statement-breakpoint
CREATE INDEX "background_jobs_site_id_index" ON "background_jobs" USING btree ("site_id");--> statement-breakpoint
CREATE INDEX "background_jobs_status_finished_at_index" ON "background_jobs" USING btree ("status","finished_at");--> statement-breakpoint
-- Every app server keeps people's rights and each site's revision in memory and drops them when told, on
-- the channel bayward_changes (delivered at commit, once per distinct payload and transaction):
--   's:<site id>'  from the revision triggers of migration 0004, on every write at the site;
--   'n:<site id>'  when a site itself changes (its name is part of everyone's rights);
--   'u:<user id>'  when a person, their memberships or a session of theirs changes or ends.
-- A change made straight in the database notifies the same way.
CREATE OR REPLACE FUNCTION site_revisions_touch(ids uuid[]) RETURNS void LANGUAGE plpgsql AS $$
BEGIN
  INSERT INTO site_revisions AS r (site_id, slot, revision, changed_at)
  SELECT id, (pg_backend_pid() % 16)::smallint, nextval('site_revision_seq'), now()
  FROM (SELECT DISTINCT id FROM unnest(ids) AS id WHERE id IS NOT NULL ORDER BY id) AS touched
  ON CONFLICT (site_id, slot) DO UPDATE SET revision = EXCLUDED.revision, changed_at = now()
  WHERE r.xmin::text::bigint <> pg_current_xact_id()::text::bigint % 4294967296;
  PERFORM pg_notify('bayward_changes', 's:' || id) FROM (SELECT DISTINCT id FROM unnest(ids) AS id WHERE id IS NOT NULL) AS touched;
END $$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION site_revisions_from_id() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN
    PERFORM site_revisions_touch(ARRAY(SELECT id FROM old_rows));
    PERFORM pg_notify('bayward_changes', 'n:' || id) FROM old_rows;
  ELSE
    PERFORM site_revisions_touch(ARRAY(SELECT id FROM new_rows));
    PERFORM pg_notify('bayward_changes', 'n:' || id) FROM new_rows;
  END IF;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE FUNCTION people_changed_notify() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE
  user_column text := CASE WHEN TG_TABLE_NAME = 'users' THEN 'id' ELSE 'user_id' END;
BEGIN
  IF TG_OP = 'DELETE' THEN
    EXECUTE format('SELECT pg_notify(''bayward_changes'', ''u:'' || u) FROM (SELECT DISTINCT %I AS u FROM old_rows) AS changed', user_column);
  ELSIF TG_OP = 'UPDATE' THEN
    EXECUTE format('SELECT pg_notify(''bayward_changes'', ''u:'' || u) FROM (SELECT %I AS u FROM old_rows UNION SELECT %I FROM new_rows) AS changed', user_column, user_column);
  ELSE
    EXECUTE format('SELECT pg_notify(''bayward_changes'', ''u:'' || u) FROM (SELECT DISTINCT %I AS u FROM new_rows) AS changed', user_column);
  END IF;
  RETURN NULL;
END $$;
--> statement-breakpoint
-- A new session row is nobody's cached rights yet, so user_sessions notifies on update and delete only.
DO $$
DECLARE
  t text;
BEGIN
  FOREACH t IN ARRAY ARRAY['users', 'memberships', 'user_sessions'] LOOP
    IF t <> 'user_sessions' THEN
      EXECUTE format('CREATE TRIGGER %I AFTER INSERT ON %I REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION people_changed_notify()', t || '_people_insert', t);
    END IF;
    EXECUTE format('CREATE TRIGGER %I AFTER UPDATE ON %I REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION people_changed_notify()', t || '_people_update', t);
    EXECUTE format('CREATE TRIGGER %I AFTER DELETE ON %I REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION people_changed_notify()', t || '_people_delete', t);
  END LOOP;
END $$;
--> statement-breakpoint
-- A queued job wakes every server's workers at once ('j'), instead of at their next poll.
CREATE FUNCTION background_jobs_queued_notify() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  PERFORM pg_notify('bayward_changes', 'j:');
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER background_jobs_queued AFTER INSERT ON background_jobs FOR EACH STATEMENT EXECUTE FUNCTION background_jobs_queued_notify();
