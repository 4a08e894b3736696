CREATE TABLE "charge_month_rollups" (
	"site_id" uuid NOT NULL,
	"month" text NOT NULL,
	"chargers" jsonb NOT NULL,
	"kwh" double precision NOT NULL,
	"peak_kwh" double precision NOT NULL,
	"latest_end" timestamp with time zone,
	"time_zone" text NOT NULL,
	"peak_periods" jsonb NOT NULL,
	"made_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "charge_month_rollups_site_id_month_pk" PRIMARY KEY("site_id","month")
);
--> statement-breakpoint
ALTER TABLE "charge_month_rollups" ADD CONSTRAINT "charge_month_rollups_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
-- A write to charge_sessions drops the closed months it touches (the month each row starts in, and the
-- month of the row a correction supersedes) so the next report makes them again from the records. Months
-- not over yet in the site's time zone are never kept, so the everyday writes of the current month skip
-- this. Each dropped month is locked (shared) until the write commits: the report that makes a month takes
-- the same lock exclusively before reading, so it never keeps a month made without a write in flight.
CREATE OR REPLACE FUNCTION charge_month_rollups_drop_one(site uuid, month_text text) RETURNS void LANGUAGE plpgsql AS $$
BEGIN
  PERFORM pg_advisory_xact_lock_shared(hashtext('charge_month_rollups'), hashtext(site::text || month_text));
  DELETE FROM charge_month_rollups WHERE site_id = site AND month = month_text;
END $$;
--> statement-breakpoint
-- (each transition table is named only for the events that have it, hence one loop per event)
CREATE OR REPLACE FUNCTION charge_month_rollups_drop() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE
  k record;
BEGIN
  IF TG_OP = 'INSERT' THEN
    FOR k IN
      SELECT DISTINCT t.site_id, to_char(t.at AT TIME ZONE s.time_zone, 'YYYY-MM') AS month
      FROM (SELECT site_id, at FROM new_rows UNION ALL SELECT c.site_id, c.at FROM new_rows n JOIN charge_sessions c ON c.id = n.corrects_id) t JOIN sites s ON s.id = t.site_id
      WHERE t.at < date_trunc('month', clock_timestamp() AT TIME ZONE s.time_zone) AT TIME ZONE s.time_zone
      ORDER BY 1, 2
    LOOP
      PERFORM charge_month_rollups_drop_one(k.site_id, k.month);
    END LOOP;
  ELSIF TG_OP = 'UPDATE' THEN
    FOR k IN
      SELECT DISTINCT t.site_id, to_char(t.at AT TIME ZONE s.time_zone, 'YYYY-MM') AS month
      FROM (SELECT site_id, at FROM new_rows UNION ALL SELECT site_id, at FROM old_rows) t JOIN sites s ON s.id = t.site_id
      WHERE t.at < date_trunc('month', clock_timestamp() AT TIME ZONE s.time_zone) AT TIME ZONE s.time_zone
      ORDER BY 1, 2
    LOOP
      PERFORM charge_month_rollups_drop_one(k.site_id, k.month);
    END LOOP;
  ELSE
    FOR k IN
      SELECT DISTINCT t.site_id, to_char(t.at AT TIME ZONE s.time_zone, 'YYYY-MM') AS month
      FROM (SELECT site_id, at FROM old_rows) t JOIN sites s ON s.id = t.site_id
      WHERE t.at < date_trunc('month', clock_timestamp() AT TIME ZONE s.time_zone) AT TIME ZONE s.time_zone
      ORDER BY 1, 2
    LOOP
      PERFORM charge_month_rollups_drop_one(k.site_id, k.month);
    END LOOP;
  END IF;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER charge_sessions_rollup_insert AFTER INSERT ON charge_sessions REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION charge_month_rollups_drop();
--> statement-breakpoint
CREATE TRIGGER charge_sessions_rollup_update AFTER UPDATE ON charge_sessions REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION charge_month_rollups_drop();
--> statement-breakpoint
CREATE TRIGGER charge_sessions_rollup_delete AFTER DELETE ON charge_sessions REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION charge_month_rollups_drop();
