-- Each app server keeps what it reads of a site's configuration (the site row: settings, time zone; and the
-- site's schedules) until that changes, rather than until the next record written at the site. The site row
-- already notifies 'n:<site id>' (0007); a schedule added, changed or removed notifies 'c:<site id>'. A change
-- made straight in the database notifies the same way.
CREATE FUNCTION site_config_changed_notify() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN
    PERFORM pg_notify('bayward_changes', 'c:' || site_id) FROM (SELECT DISTINCT site_id FROM old_rows) AS changed;
  ELSIF TG_OP = 'UPDATE' THEN
    PERFORM pg_notify('bayward_changes', 'c:' || site_id) FROM (SELECT site_id FROM old_rows UNION SELECT site_id FROM new_rows) AS changed;
  ELSE
    PERFORM pg_notify('bayward_changes', 'c:' || site_id) FROM (SELECT DISTINCT site_id FROM new_rows) AS changed;
  END IF;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER "schedules_config_insert" AFTER INSERT ON "schedules" REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION site_config_changed_notify();
--> statement-breakpoint
CREATE TRIGGER "schedules_config_update" AFTER UPDATE ON "schedules" REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION site_config_changed_notify();
--> statement-breakpoint
CREATE TRIGGER "schedules_config_delete" AFTER DELETE ON "schedules" REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION site_config_changed_notify();
