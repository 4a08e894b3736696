CREATE TABLE "schedule_completions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"recorded_at" timestamp with time zone DEFAULT now() NOT NULL,
	"idempotency_key" text,
	"note" text DEFAULT '' NOT NULL,
	"schedule_id" uuid NOT NULL,
	"subject_kind" text NOT NULL,
	"subject_id" uuid NOT NULL,
	"done_on" date NOT NULL,
	"hour_meter" double precision,
	"certificate_upload_id" uuid,
	"corrects_id" uuid,
	"correction_reason" text
);
--> statement-breakpoint
CREATE TABLE "battery_status" (
	"battery_id" uuid PRIMARY KEY NOT NULL,
	"site_id" uuid NOT NULL,
	"state" text NOT NULL,
	"state_since" timestamp with time zone NOT NULL,
	"ready_at" timestamp with time zone,
	"truck_id" uuid,
	"charge_session_id" uuid,
	"charger_id" uuid,
	"cycles" integer DEFAULT 0 NOT NULL,
	"last_charge_ended_at" timestamp with time zone,
	"last_charge_outcome" charge_outcome,
	"last_end_temp_f" double precision,
	"ran_hot" boolean DEFAULT false NOT NULL,
	"last_installed_at" timestamp with time zone,
	"last_removed_at" timestamp with time zone,
	"charges_since_watering" integer DEFAULT 0 NOT NULL,
	"last_watered_at" timestamp with time zone,
	"charges_since_equalize" integer DEFAULT 0 NOT NULL,
	"last_equalized_at" timestamp with time zone,
	"last_check_at" timestamp with time zone,
	"last_sg" double precision,
	"last_soc_pct" double precision,
	"last_cell_check_at" timestamp with time zone,
	"last_spread" double precision,
	"low_cell_count" integer,
	"weak_cell" boolean DEFAULT false NOT NULL,
	"computed_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "obligations" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"rule_key" text NOT NULL,
	"kind" text NOT NULL,
	"schedule_id" uuid,
	"subject_kind" text NOT NULL,
	"subject_id" uuid NOT NULL,
	"label" text NOT NULL,
	"tag_code" text,
	"area_id" uuid,
	"person_id" uuid,
	"period_start" date,
	"what" text NOT NULL,
	"due_on" date,
	"due_at_count" double precision,
	"count_now" double precision,
	"count_unit" text,
	"due_soon_days" integer NOT NULL,
	"responsible_role" "role" NOT NULL,
	"last_done_on" date,
	"detail" text,
	"computed_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "read_model_rebuilds" (
	"id" integer PRIMARY KEY NOT NULL,
	"needed" boolean DEFAULT true NOT NULL,
	"reason" text DEFAULT '' NOT NULL,
	"requested_at" timestamp with time zone DEFAULT now() NOT NULL,
	"done_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "truck_status" (
	"truck_id" uuid PRIMARY KEY NOT NULL,
	"site_id" uuid NOT NULL,
	"hour_meter" double precision DEFAULT 0 NOT NULL,
	"hour_meter_at" timestamp with time zone,
	"last_inspection_at" timestamp with time zone,
	"computed_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "batteries" DROP CONSTRAINT "batteries_current_truck_id_trucks_id_fk";
--> statement-breakpoint
DROP INDEX "batteries_one_per_truck";--> statement-breakpoint
DROP INDEX "schedules_site_id_kind_index";--> statement-breakpoint
ALTER TABLE "battery_swaps" ADD COLUMN "correction_reason" text;--> statement-breakpoint
ALTER TABLE "charge_sessions" ADD COLUMN "correction_reason" text;--> statement-breakpoint
ALTER TABLE "electrolyte_checks" ADD COLUMN "correction_reason" text;--> statement-breakpoint
ALTER TABLE "co_readings" ADD COLUMN "corrects_id" uuid;--> statement-breakpoint
ALTER TABLE "co_readings" ADD COLUMN "correction_reason" text;--> statement-breakpoint
ALTER TABLE "cylinder_exchanges" ADD COLUMN "hour_meter" double precision;--> statement-breakpoint
ALTER TABLE "cylinder_exchanges" ADD COLUMN "correction_reason" text;--> statement-breakpoint
ALTER TABLE "cylinder_refills" ADD COLUMN "correction_reason" text;--> statement-breakpoint
ALTER TABLE "emissions_tests" ADD COLUMN "correction_reason" text;--> statement-breakpoint
ALTER TABLE "requalifications" ADD COLUMN "corrects_id" uuid;--> statement-breakpoint
ALTER TABLE "requalifications" ADD COLUMN "correction_reason" text;--> statement-breakpoint
ALTER TABLE "follow_ups" ADD COLUMN "opened_on" date;--> statement-breakpoint
-- Follow-ups were given "3 days on" when opened; the day they follow is that date less 3. From here on the
-- follow-up schedule decides their due date, so the stored one is cleared.
UPDATE "follow_ups" SET "opened_on" = COALESCE("due_on" - 3, "created_at"::date), "due_on" = NULL;--> statement-breakpoint
ALTER TABLE "follow_ups" ALTER COLUMN "opened_on" SET NOT NULL;--> statement-breakpoint
ALTER TABLE "schedules" ADD COLUMN "subject_kind" text;--> statement-breakpoint
ALTER TABLE "schedules" ADD COLUMN "after_fail_days" integer;--> statement-breakpoint
ALTER TABLE "schedules" ADD COLUMN "created_by" uuid;--> statement-breakpoint
ALTER TABLE "schedule_completions" ADD CONSTRAINT "schedule_completions_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "schedule_completions" ADD CONSTRAINT "schedule_completions_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "schedule_completions" ADD CONSTRAINT "schedule_completions_schedule_id_schedules_id_fk" FOREIGN KEY ("schedule_id") REFERENCES "public"."schedules"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "schedule_completions" ADD CONSTRAINT "schedule_completions_certificate_upload_id_uploads_id_fk" FOREIGN KEY ("certificate_upload_id") REFERENCES "public"."uploads"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "schedule_completions" ADD CONSTRAINT "schedule_completions_corrects_id_schedule_completions_id_fk" FOREIGN KEY ("corrects_id") REFERENCES "public"."schedule_completions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "battery_status" ADD CONSTRAINT "battery_status_battery_id_batteries_id_fk" FOREIGN KEY ("battery_id") REFERENCES "public"."batteries"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "battery_status" ADD CONSTRAINT "battery_status_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "battery_status" ADD CONSTRAINT "battery_status_truck_id_trucks_id_fk" FOREIGN KEY ("truck_id") REFERENCES "public"."trucks"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "battery_status" ADD CONSTRAINT "battery_status_charge_session_id_charge_sessions_id_fk" FOREIGN KEY ("charge_session_id") REFERENCES "public"."charge_sessions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "battery_status" ADD CONSTRAINT "battery_status_charger_id_chargers_id_fk" FOREIGN KEY ("charger_id") REFERENCES "public"."chargers"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "obligations" ADD CONSTRAINT "obligations_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "obligations" ADD CONSTRAINT "obligations_schedule_id_schedules_id_fk" FOREIGN KEY ("schedule_id") REFERENCES "public"."schedules"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "truck_status" ADD CONSTRAINT "truck_status_truck_id_trucks_id_fk" FOREIGN KEY ("truck_id") REFERENCES "public"."trucks"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "truck_status" ADD CONSTRAINT "truck_status_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "schedule_completions_schedule_id_subject_id_done_on_index" ON "schedule_completions" USING btree ("schedule_id","subject_id","done_on");--> statement-breakpoint
CREATE INDEX "schedule_completions_subject_id_index" ON "schedule_completions" USING btree ("subject_id");--> statement-breakpoint
CREATE INDEX "schedule_completions_site_id_at_index" ON "schedule_completions" USING btree ("site_id","at");--> statement-breakpoint
CREATE UNIQUE INDEX "schedule_completions_idem" ON "schedule_completions" USING btree ("idempotency_key") WHERE "schedule_completions"."idempotency_key" IS NOT NULL;--> statement-breakpoint
CREATE INDEX "schedule_completions_user_id_index" ON "schedule_completions" USING btree ("user_id");--> statement-breakpoint
CREATE INDEX "schedule_completions_certificate_upload_id_index" ON "schedule_completions" USING btree ("certificate_upload_id");--> statement-breakpoint
CREATE INDEX "schedule_completions_corrects_id_index" ON "schedule_completions" USING btree ("corrects_id");--> statement-breakpoint
CREATE INDEX "battery_status_site_id_state_index" ON "battery_status" USING btree ("site_id","state");--> statement-breakpoint
CREATE UNIQUE INDEX "battery_status_one_per_truck" ON "battery_status" USING btree ("truck_id") WHERE "battery_status"."truck_id" IS NOT NULL;--> statement-breakpoint
CREATE INDEX "battery_status_charger_id_index" ON "battery_status" USING btree ("charger_id");--> statement-breakpoint
CREATE INDEX "battery_status_charge_session_id_index" ON "battery_status" USING btree ("charge_session_id");--> statement-breakpoint
CREATE UNIQUE INDEX "obligations_subject_rule" ON "obligations" USING btree ("site_id","rule_key","subject_kind","subject_id");--> statement-breakpoint
CREATE INDEX "obligations_subject_id_index" ON "obligations" USING btree ("subject_id");--> statement-breakpoint
CREATE INDEX "obligations_site_id_due_on_index" ON "obligations" USING btree ("site_id","due_on");--> statement-breakpoint
CREATE INDEX "obligations_schedule_id_index" ON "obligations" USING btree ("schedule_id");--> statement-breakpoint
CREATE INDEX "truck_status_site_id_index" ON "truck_status" USING btree ("site_id");--> statement-breakpoint
ALTER TABLE "co_readings" ADD CONSTRAINT "co_readings_corrects_id_co_readings_id_fk" FOREIGN KEY ("corrects_id") REFERENCES "public"."co_readings"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "requalifications" ADD CONSTRAINT "requalifications_corrects_id_requalifications_id_fk" FOREIGN KEY ("corrects_id") REFERENCES "public"."requalifications"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "schedules" ADD CONSTRAINT "schedules_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "co_readings_corrects_id_index" ON "co_readings" USING btree ("corrects_id");--> statement-breakpoint
CREATE INDEX "requalifications_corrects_id_index" ON "requalifications" USING btree ("corrects_id");--> statement-breakpoint
CREATE INDEX "schedules_created_by_index" ON "schedules" USING btree ("created_by");--> statement-breakpoint
CREATE UNIQUE INDEX "schedules_site_id_kind_index" ON "schedules" USING btree ("site_id","kind") WHERE "schedules"."kind" <> 'custom';--> statement-breakpoint
ALTER TABLE "batteries" DROP COLUMN "cycle_count";--> statement-breakpoint
ALTER TABLE "batteries" DROP COLUMN "current_truck_id";--> statement-breakpoint
-- Schedules become the one source of every interval: each site's interval settings are carried into its
-- schedule rows. Where a site already had its own row of a kind (the Schedules page's value, the one
-- the due list read), that row stands; otherwise a row is made from the setting, or the default.
INSERT INTO "schedules" ("site_id", "kind", "title", "applies_to", "rule", "every", "every_unit", "within_days", "due_soon_days", "responsible_role", "source", "active")
SELECT s."id", v.kind, v.title, v.applies_to, v.rule::schedule_rule,
  COALESCE((s."settings"->>v.every_key)::int, v.every_default), v.every_unit,
  CASE WHEN v.within_key IS NULL THEN NULL ELSE COALESCE((s."settings"->>v.within_key)::int, v.within_default) END,
  v.due_soon, v.role::role, v.source, true
FROM "sites" s
CROSS JOIN (VALUES
  ('battery_watering', 'Battery watering', 'Flooded lead-acid batteries', 'charges', 'wateringEveryCharges', 5, NULL, 'wateringEveryDays', 7, 1, 'technician', 'Common practice; follow the battery maker. Water after charging (battery care guides).'),
  ('battery_equalize', 'Equalize charge', 'Flooded lead-acid batteries', 'charges', 'equalizeEveryCharges', 5, NULL, 'equalizeEveryDays', 7, 1, 'technician', 'Weekly or every 5th cycle, per the battery maker (common practice)'),
  ('charger_inspection', 'Charger and cable inspection', 'Chargers', 'days', 'chargerInspectionEveryDays', 30, 'day', NULL, NULL, 7, 'technician', 'Site policy (common practice); chargers protected from truck damage, 29 CFR 1910.178(g)(2)'),
  ('electrolyte_full_check', 'Every-cell specific gravity', 'Flooded lead-acid batteries', 'days', 'fullCellCheckEveryDays', 30, 'day', NULL, NULL, 3, 'technician', 'Common practice: a full-cell hydrometer reading monthly; follow the battery maker')
) AS v(kind, title, applies_to, rule, every_key, every_default, every_unit, within_key, within_default, due_soon, role, source)
WHERE NOT EXISTS (SELECT 1 FROM "schedules" x WHERE x."site_id" = s."id" AND x."kind" = v.kind);--> statement-breakpoint
-- The emissions retest window after a failed test moves from settings to the emissions schedule.
INSERT INTO "schedules" ("site_id", "kind", "title", "applies_to", "rule", "every", "every_unit", "due_soon_days", "responsible_role", "source", "active")
SELECT s."id", 'emissions_test', 'Emissions test', 'Combustion trucks', 'days', 1, 'year', 30, 'facilities_lead',
  'Site policy; Minnesota Rules 5205.0116 as the published example (no federal rule requires yearly tailpipe tests)', true
FROM "sites" s WHERE NOT EXISTS (SELECT 1 FROM "schedules" x WHERE x."site_id" = s."id" AND x."kind" = 'emissions_test');--> statement-breakpoint
UPDATE "schedules" x SET "after_fail_days" = COALESCE((s."settings"->>'emissionsRetestDays')::int, 30)
FROM "sites" s WHERE x."site_id" = s."id" AND x."kind" = 'emissions_test';--> statement-breakpoint
UPDATE "sites" SET "settings" = "settings" - 'wateringEveryCharges' - 'wateringEveryDays' - 'equalizeEveryCharges' - 'equalizeEveryDays'
  - 'chargerInspectionEveryDays' - 'fullCellCheckEveryDays' - 'emissionsRetestDays' - 'dueSoonDays';--> statement-breakpoint
-- Completion records are event records: they move the site revision like the others (see 0004).
CREATE TRIGGER schedule_completions_revision_insert AFTER INSERT ON schedule_completions REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION site_revisions_from_site_id();--> statement-breakpoint
CREATE TRIGGER schedule_completions_revision_update AFTER UPDATE ON schedule_completions REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION site_revisions_from_site_id();--> statement-breakpoint
CREATE TRIGGER schedule_completions_revision_delete AFTER DELETE ON schedule_completions REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION site_revisions_from_site_id();--> statement-breakpoint
-- The read models are new: `npm run rebuild-state` (set-up, or the server at start) fills them from the records.
INSERT INTO "read_model_rebuilds" ("id", "needed", "reason") VALUES (1, true, '0008: battery status, truck status and obligations introduced')
ON CONFLICT ("id") DO UPDATE SET "needed" = true, "reason" = EXCLUDED."reason", "requested_at" = now();