CREATE TABLE "site_revisions" (
	"site_id" uuid NOT NULL,
	"slot" smallint NOT NULL,
	"revision" bigint DEFAULT 0 NOT NULL,
	"changed_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "site_revisions_site_id_slot_pk" PRIMARY KEY("site_id","slot")
);

--> statement-breakpoint
-- A small table updated all day: room on each page for the new row versions, and vacuumed often.
ALTER TABLE "site_revisions" SET (fillfactor = 20, autovacuum_vacuum_scale_factor = 0, autovacuum_vacuum_threshold = 500);
--> statement-breakpoint
-- Values only ever grow, even across a TRUNCATE of every table (the sequence belongs to no column).
CREATE SEQUENCE site_revision_seq;
--> statement-breakpoint
-- Moves the revision of each site in ids on, in this connection's slot (16 slots: the
-- SITE_REVISION_SLOTS of the schema). Rows are taken in id order so two statements that touch several
-- sites lock them in the same order.
-- A transaction moves each site's slot once, however many statements it runs: the row is left alone
-- when this transaction already wrote it (its xmin is this transaction's id), which keeps the table
-- from filling with dead row versions.
CREATE FUNCTION site_revisions_touch(ids uuid[]) RETURNS void LANGUAGE sql AS $$
  INSERT INTO site_revisions AS r (site_id, slot, revision, changed_at)
  SELECT id, (pg_backend_pid() % 16)::smallint, nextval('site_revision_seq'), now()
  FROM (SELECT DISTINCT id FROM unnest(ids) AS id WHERE id IS NOT NULL ORDER BY id) AS touched
  ON CONFLICT (site_id, slot) DO UPDATE SET revision = EXCLUDED.revision, changed_at = now()
  WHERE r.xmin::text::bigint <> pg_current_xact_id()::text::bigint % 4294967296
$$;
--> statement-breakpoint
-- For tables with a site_id: once per statement, from its transition tables.
CREATE FUNCTION site_revisions_from_site_id() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP = 'INSERT' THEN
    PERFORM site_revisions_touch(ARRAY(SELECT site_id FROM new_rows));
  ELSIF TG_OP = 'UPDATE' THEN
    PERFORM site_revisions_touch(ARRAY(SELECT site_id FROM new_rows UNION SELECT site_id FROM old_rows));
  ELSE
    PERFORM site_revisions_touch(ARRAY(SELECT site_id FROM old_rows));
  END IF;
  RETURN NULL;
END $$;
--> statement-breakpoint
-- The sites table itself (settings, name, time zone).
CREATE FUNCTION site_revisions_from_id() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN
    PERFORM site_revisions_touch(ARRAY(SELECT id FROM old_rows));
  ELSE
    PERFORM site_revisions_touch(ARRAY(SELECT id FROM new_rows));
  END IF;
  RETURN NULL;
END $$;
--> statement-breakpoint
-- People and their qualifications belong to no one site: every site the person is a member of.
CREATE FUNCTION site_revisions_from_user() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE
  user_column text := CASE WHEN TG_TABLE_NAME = 'users' THEN 'id' ELSE 'user_id' END;
BEGIN
  IF TG_OP = 'DELETE' THEN
    EXECUTE format('SELECT site_revisions_touch(ARRAY(SELECT m.site_id FROM memberships m WHERE m.user_id IN (SELECT %I FROM old_rows)))', user_column);
  ELSE
    EXECUTE format('SELECT site_revisions_touch(ARRAY(SELECT m.site_id FROM memberships m WHERE m.user_id IN (SELECT %I FROM new_rows)))', user_column);
  END IF;
  RETURN NULL;
END $$;
--> statement-breakpoint
DO $$
DECLARE
  t text;
  fn text;
BEGIN
  FOREACH t IN ARRAY ARRAY[
    'areas', 'trucks', 'batteries', 'chargers', 'lp_cylinders', 'tags', 'memberships', 'asset_holds',
    'battery_swaps', 'charge_sessions', 'electrolyte_checks',
    'cylinder_refills', 'cylinder_exchanges', 'requalifications', 'emissions_tests', 'co_readings',
    'schedules', 'checklist_templates', 'area_logs', 'area_log_entries', 'follow_ups', 'incidents', 'uploads',
    'sites', 'users', 'qualifications'
  ] LOOP
    fn := CASE t WHEN 'sites' THEN 'site_revisions_from_id' WHEN 'users' THEN 'site_revisions_from_user' WHEN 'qualifications' THEN 'site_revisions_from_user' ELSE 'site_revisions_from_site_id' END;
    EXECUTE format('CREATE TRIGGER %I AFTER INSERT ON %I REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION %I()', t || '_revision_insert', t, fn);
    EXECUTE format('CREATE TRIGGER %I AFTER UPDATE ON %I REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION %I()', t || '_revision_update', t, fn);
    EXECUTE format('CREATE TRIGGER %I AFTER DELETE ON %I REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION %I()', t || '_revision_delete', t, fn);
  END LOOP;
END $$;
