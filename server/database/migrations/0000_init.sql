CREATE TYPE "public"."area_kind" AS ENUM('charging_area', 'fuel_station');--> statement-breakpoint
CREATE TYPE "public"."asset_kind" AS ENUM('battery', 'charger', 'cylinder', 'truck', 'area');--> statement-breakpoint
CREATE TYPE "public"."battery_chemistry" AS ENUM('flooded_lead_acid', 'agm', 'gel', 'lithium_ion');--> statement-breakpoint
CREATE TYPE "public"."charge_outcome" AS ENUM('complete', 'interrupted');--> statement-breakpoint
CREATE TYPE "public"."charger_type" AS ENUM('iu', 'iui', 'taper', 'lithium');--> statement-breakpoint
CREATE TYPE "public"."check_result" AS ENUM('pass', 'fail', 'not_applicable');--> statement-breakpoint
CREATE TYPE "public"."checklist_cadence" AS ENUM('daily', 'weekly');--> statement-breakpoint
CREATE TYPE "public"."cylinder_spec" AS ENUM('dot_4bw', 'dot_4e', 'tc_4bwm', 'tc_4em');--> statement-breakpoint
CREATE TYPE "public"."cylinder_status" AS ENUM('full', 'empty', 'in_use', 'quarantined', 'condemned');--> statement-breakpoint
CREATE TYPE "public"."electrolyte_level" AS ENUM('low', 'ok', 'high');--> statement-breakpoint
CREATE TYPE "public"."hold_action" AS ENUM('hold', 'release');--> statement-breakpoint
CREATE TYPE "public"."incident_kind" AS ENUM('electrolyte_spill', 'damaged_battery', 'cylinder_leak', 'cylinder_damage', 'fire', 'near_miss', 'other');--> statement-breakpoint
CREATE TYPE "public"."mail_status" AS ENUM('queued', 'sent', 'failed');--> statement-breakpoint
CREATE TYPE "public"."qualification_kind" AS ENUM('truck_class_1', 'truck_class_2', 'truck_class_3', 'truck_class_4', 'truck_class_5', 'truck_class_6', 'truck_class_7', 'battery_changing', 'lp_gas_transfer');--> statement-breakpoint
CREATE TYPE "public"."reading_scope" AS ENUM('pilot_cell', 'every_cell');--> statement-breakpoint
CREATE TYPE "public"."requal_method" AS ENUM('water_jacket', 'proof_pressure', 'external_visual');--> statement-breakpoint
CREATE TYPE "public"."role" AS ENUM('operator', 'technician', 'facilities_lead', 'safety_lead', 'admin');--> statement-breakpoint
CREATE TYPE "public"."schedule_rule" AS ENUM('days', 'charges', 'hours', 'date_rule');--> statement-breakpoint
CREATE TYPE "public"."truck_power" AS ENUM('electric', 'lp_gas', 'gasoline', 'diesel');--> statement-breakpoint
CREATE TYPE "public"."unit_system" AS ENUM('us', 'metric');--> statement-breakpoint
CREATE TABLE "areas" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"kind" "area_kind" NOT NULL,
	"name" text NOT NULL,
	"floor_area_ft2" double precision,
	"room_volume_ft3" double precision,
	"installed_exhaust_cfm" double precision,
	"lp_storage_limit_lb" double precision,
	"notes" text DEFAULT '' NOT NULL,
	"archived" boolean DEFAULT false NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "audit_log" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"user_id" uuid,
	"site_id" uuid,
	"action" text NOT NULL,
	"entity" text NOT NULL,
	"entity_id" uuid NOT NULL,
	"before" jsonb,
	"after" jsonb,
	"note" text
);
--> statement-breakpoint
CREATE TABLE "memberships" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"user_id" uuid NOT NULL,
	"site_id" uuid NOT NULL,
	"role" "role" NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "organizations" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "qualifications" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"user_id" uuid NOT NULL,
	"kind" "qualification_kind" NOT NULL,
	"trained_on" date NOT NULL,
	"evaluated_on" date,
	"expires_on" date NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "sign_in_failures" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"key" text NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "sites" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"organization_id" uuid NOT NULL,
	"name" text NOT NULL,
	"address" text DEFAULT '' NOT NULL,
	"time_zone" text DEFAULT 'America/Chicago' NOT NULL,
	"unit_system" "unit_system" DEFAULT 'us' NOT NULL,
	"settings" jsonb NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "tag_counters" (
	"prefix" text PRIMARY KEY NOT NULL,
	"last" integer DEFAULT 0 NOT NULL
);
--> statement-breakpoint
CREATE TABLE "tags" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"code" text NOT NULL,
	"asset_kind" "asset_kind" NOT NULL,
	"asset_id" uuid NOT NULL,
	"site_id" uuid NOT NULL,
	"issued_at" timestamp with time zone DEFAULT now() NOT NULL,
	"retired_at" timestamp with time zone,
	"replaced_by_code" text,
	"printed_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "users" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"email" text NOT NULL,
	"name" text NOT NULL,
	"password_hash" text NOT NULL,
	"active" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "batteries" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"out_of_service" boolean DEFAULT false NOT NULL,
	"out_of_service_reason" text,
	"notes" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"serial" text NOT NULL,
	"home_area_id" uuid,
	"chemistry" "battery_chemistry" NOT NULL,
	"voltage" integer NOT NULL,
	"cell_count" integer NOT NULL,
	"capacity_ah" integer NOT NULL,
	"capacity_hour_rate" smallint DEFAULT 6 NOT NULL,
	"weight_lb" double precision NOT NULL,
	"length_in" double precision NOT NULL,
	"width_in" double precision NOT NULL,
	"height_in" double precision NOT NULL,
	"connector" text NOT NULL,
	"manufactured_on" date,
	"in_service_on" date,
	"rated_cycles" integer DEFAULT 1500 NOT NULL,
	"cycle_count" integer DEFAULT 0 NOT NULL,
	"current_truck_id" uuid
);
--> statement-breakpoint
CREATE TABLE "chargers" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"out_of_service" boolean DEFAULT false NOT NULL,
	"out_of_service_reason" text,
	"notes" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"name" text NOT NULL,
	"serial" text DEFAULT '' NOT NULL,
	"area_id" uuid NOT NULL,
	"charger_type" charger_type NOT NULL,
	"output_voltage" integer NOT NULL,
	"max_current_a" double precision NOT NULL,
	"min_capacity_ah" integer NOT NULL,
	"max_capacity_ah" integer NOT NULL,
	"chemistry_profiles" "battery_chemistry"[] NOT NULL,
	"efficiency" double precision DEFAULT 0.85 NOT NULL,
	"gassing_current_a" double precision
);
--> statement-breakpoint
CREATE TABLE "lp_cylinders" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"out_of_service" boolean DEFAULT false NOT NULL,
	"out_of_service_reason" text,
	"notes" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"serial" text NOT NULL,
	"area_id" uuid,
	"specification" "cylinder_spec" NOT NULL,
	"water_capacity_lb" double precision NOT NULL,
	"tare_lb" double precision NOT NULL,
	"nominal_propane_lb" double precision NOT NULL,
	"manufacture_year" smallint NOT NULL,
	"manufacture_month" smallint NOT NULL,
	"last_requalified_on" date,
	"last_requalification_method" "requal_method",
	"status" "cylinder_status" DEFAULT 'empty' NOT NULL,
	"current_truck_id" uuid,
	"status_changed_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "cylinders_month_range" CHECK ("lp_cylinders"."manufacture_month" BETWEEN 1 AND 12)
);
--> statement-breakpoint
CREATE TABLE "trucks" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"out_of_service" boolean DEFAULT false NOT NULL,
	"out_of_service_reason" text,
	"notes" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"fleet_number" text NOT NULL,
	"truck_class" smallint NOT NULL,
	"power" "truck_power" NOT NULL,
	"model" text DEFAULT '' NOT NULL,
	"home_area_id" uuid,
	"system_voltage" integer,
	"compartment_length_in" double precision,
	"compartment_width_in" double precision,
	"compartment_height_in" double precision,
	"min_battery_weight_lb" double precision,
	"max_battery_weight_lb" double precision,
	"connector" text,
	"allowed_chemistries" "battery_chemistry"[] DEFAULT '{}' NOT NULL,
	"hour_meter" double precision DEFAULT 0 NOT NULL,
	CONSTRAINT "trucks_class_range" CHECK ("trucks"."truck_class" BETWEEN 1 AND 7)
);
--> statement-breakpoint
CREATE TABLE "asset_holds" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"recorded_at" timestamp with time zone DEFAULT now() NOT NULL,
	"idempotency_key" text,
	"note" text DEFAULT '' NOT NULL,
	"asset_kind" "asset_kind" NOT NULL,
	"asset_id" uuid NOT NULL,
	"action" "hold_action" NOT NULL,
	"reason" text NOT NULL
);
--> statement-breakpoint
CREATE TABLE "battery_swaps" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"recorded_at" timestamp with time zone DEFAULT now() NOT NULL,
	"idempotency_key" text,
	"note" text DEFAULT '' NOT NULL,
	"truck_id" uuid NOT NULL,
	"battery_out_id" uuid,
	"battery_in_id" uuid NOT NULL,
	"hour_meter" double precision,
	"override_reason" text,
	"overridden_checks" jsonb,
	"corrects_id" uuid
);
--> statement-breakpoint
CREATE TABLE "cell_readings" (
	"check_id" uuid NOT NULL,
	"cell_number" integer NOT NULL,
	"specific_gravity" double precision NOT NULL,
	"temperature_f" double precision NOT NULL,
	"corrected_sg" double precision NOT NULL,
	"low" boolean DEFAULT false NOT NULL,
	CONSTRAINT "cell_readings_check_id_cell_number_pk" PRIMARY KEY("check_id","cell_number")
);
--> statement-breakpoint
CREATE TABLE "charge_sessions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"recorded_at" timestamp with time zone DEFAULT now() NOT NULL,
	"idempotency_key" text,
	"note" text DEFAULT '' NOT NULL,
	"battery_id" uuid NOT NULL,
	"charger_id" uuid NOT NULL,
	"ended_at" timestamp with time zone,
	"ended_by" uuid,
	"amp_hours_returned" double precision,
	"end_temp_f" double precision,
	"equalize" boolean DEFAULT false NOT NULL,
	"outcome" charge_outcome,
	"grid_kwh" double precision,
	"energy_cost" double precision,
	"counted_cycle" boolean DEFAULT false NOT NULL,
	"ran_hot" boolean DEFAULT false NOT NULL,
	"override_reason" text,
	"corrects_id" uuid
);
--> statement-breakpoint
CREATE TABLE "electrolyte_checks" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"recorded_at" timestamp with time zone DEFAULT now() NOT NULL,
	"idempotency_key" text,
	"note" text DEFAULT '' NOT NULL,
	"battery_id" uuid NOT NULL,
	"level" "electrolyte_level" NOT NULL,
	"water_added_gal" double precision DEFAULT 0 NOT NULL,
	"scope" "reading_scope",
	"reference_temp_f" double precision,
	"correction_per_deg_f" double precision,
	"mean_corrected_sg" double precision,
	"spread" double precision,
	"low_cell_count" integer DEFAULT 0 NOT NULL,
	"state_of_charge_pct" double precision,
	"after_charge" boolean DEFAULT false NOT NULL,
	"corrects_id" uuid
);
--> statement-breakpoint
CREATE TABLE "co_readings" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"recorded_at" timestamp with time zone DEFAULT now() NOT NULL,
	"idempotency_key" text,
	"note" text DEFAULT '' NOT NULL,
	"area_id" uuid NOT NULL,
	"taken_on" date NOT NULL,
	"ppm" double precision NOT NULL,
	"duration_hours" double precision NOT NULL
);
--> statement-breakpoint
CREATE TABLE "cylinder_exchanges" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"recorded_at" timestamp with time zone DEFAULT now() NOT NULL,
	"idempotency_key" text,
	"note" text DEFAULT '' NOT NULL,
	"truck_id" uuid NOT NULL,
	"cylinder_off_id" uuid,
	"cylinder_on_id" uuid NOT NULL,
	"corrects_id" uuid
);
--> statement-breakpoint
CREATE TABLE "cylinder_refills" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"recorded_at" timestamp with time zone DEFAULT now() NOT NULL,
	"idempotency_key" text,
	"note" text DEFAULT '' NOT NULL,
	"cylinder_id" uuid NOT NULL,
	"inspection" jsonb NOT NULL,
	"refused" boolean DEFAULT false NOT NULL,
	"refusal_reasons" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"gross_before_lb" double precision,
	"gross_after_lb" double precision,
	"measured_tare_lb" double precision,
	"product_sg" double precision,
	"net_added_lb" double precision,
	"fill_limit_lb" double precision,
	"overfilled" boolean DEFAULT false NOT NULL,
	"gallons_at60_f" double precision,
	"tare_flagged" boolean DEFAULT false NOT NULL,
	"corrects_id" uuid
);
--> statement-breakpoint
CREATE TABLE "emissions_tests" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"recorded_at" timestamp with time zone DEFAULT now() NOT NULL,
	"idempotency_key" text,
	"note" text DEFAULT '' NOT NULL,
	"truck_id" uuid NOT NULL,
	"tested_on" date NOT NULL,
	"tester_name" text NOT NULL,
	"co_idle_pct" double precision NOT NULL,
	"co_high_idle_pct" double precision NOT NULL,
	"hc_ppm" double precision,
	"co2_pct" double precision,
	"o2_pct" double precision,
	"idle_rpm" double precision,
	"high_idle_rpm" double precision,
	"passed" boolean NOT NULL,
	"reasons" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"next_due_on" date NOT NULL,
	"certificate_upload_id" uuid,
	"corrects_id" uuid
);
--> statement-breakpoint
CREATE TABLE "requalifications" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"recorded_at" timestamp with time zone DEFAULT now() NOT NULL,
	"idempotency_key" text,
	"note" text DEFAULT '' NOT NULL,
	"cylinder_id" uuid NOT NULL,
	"performed_on" date NOT NULL,
	"method" "requal_method" NOT NULL,
	"marking" text DEFAULT '' NOT NULL,
	"passed" boolean NOT NULL,
	"next_due_on" date
);
--> statement-breakpoint
CREATE TABLE "area_log_entries" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"recorded_at" timestamp with time zone DEFAULT now() NOT NULL,
	"idempotency_key" text,
	"note" text DEFAULT '' NOT NULL,
	"log_id" uuid NOT NULL,
	"item_key" text NOT NULL,
	"result" "check_result" NOT NULL,
	"corrects_id" uuid,
	"correction_reason" text
);
--> statement-breakpoint
CREATE TABLE "area_logs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"area_id" uuid NOT NULL,
	"template_id" uuid NOT NULL,
	"cadence" "checklist_cadence" NOT NULL,
	"period_start" date NOT NULL,
	"signed_by" uuid,
	"signed_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "calendar_feeds" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"user_id" uuid NOT NULL,
	"token_hash" text NOT NULL,
	"revoked_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "checklist_templates" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"area_kind" "area_kind" NOT NULL,
	"cadence" "checklist_cadence" NOT NULL,
	"title" text NOT NULL,
	"items" jsonb NOT NULL,
	"version" integer DEFAULT 1 NOT NULL,
	"active" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "follow_ups" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"source" text NOT NULL,
	"source_id" uuid NOT NULL,
	"title" text NOT NULL,
	"owner_user_id" uuid,
	"due_on" date,
	"closed_at" timestamp with time zone,
	"closed_by" uuid,
	"closing_note" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "incidents" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"recorded_at" timestamp with time zone DEFAULT now() NOT NULL,
	"idempotency_key" text,
	"note" text DEFAULT '' NOT NULL,
	"kind" "incident_kind" NOT NULL,
	"area_id" uuid,
	"asset_kind" "asset_kind",
	"asset_id" uuid,
	"description" text NOT NULL,
	"immediate_actions" text DEFAULT '' NOT NULL,
	"follow_up_owner_id" uuid,
	"photo_upload_ids" uuid[] DEFAULT '{}' NOT NULL
);
--> statement-breakpoint
CREATE TABLE "mail_messages" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid,
	"to_address" text NOT NULL,
	"subject" text NOT NULL,
	"body" text NOT NULL,
	"kind" text NOT NULL,
	"status" "mail_status" DEFAULT 'queued' NOT NULL,
	"attempts" integer DEFAULT 0 NOT NULL,
	"last_error" text,
	"sent_at" timestamp with time zone,
	"next_attempt_at" timestamp with time zone DEFAULT now() NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "schedules" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"kind" text NOT NULL,
	"title" text NOT NULL,
	"applies_to" text NOT NULL,
	"rule" "schedule_rule" NOT NULL,
	"every" integer,
	"every_unit" text,
	"due_soon_days" integer DEFAULT 7 NOT NULL,
	"responsible_role" "role" NOT NULL,
	"source" text DEFAULT '' NOT NULL,
	"active" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "uploads" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"storage_key" text NOT NULL,
	"content_type" text NOT NULL,
	"bytes" integer NOT NULL,
	"sha256" text NOT NULL,
	"display_name" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "areas" ADD CONSTRAINT "areas_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audit_log" ADD CONSTRAINT "audit_log_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audit_log" ADD CONSTRAINT "audit_log_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "memberships" ADD CONSTRAINT "memberships_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "memberships" ADD CONSTRAINT "memberships_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "qualifications" ADD CONSTRAINT "qualifications_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sites" ADD CONSTRAINT "sites_organization_id_organizations_id_fk" FOREIGN KEY ("organization_id") REFERENCES "public"."organizations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tags" ADD CONSTRAINT "tags_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batteries" ADD CONSTRAINT "batteries_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batteries" ADD CONSTRAINT "batteries_home_area_id_areas_id_fk" FOREIGN KEY ("home_area_id") REFERENCES "public"."areas"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batteries" ADD CONSTRAINT "batteries_current_truck_id_trucks_id_fk" FOREIGN KEY ("current_truck_id") REFERENCES "public"."trucks"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "chargers" ADD CONSTRAINT "chargers_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "chargers" ADD CONSTRAINT "chargers_area_id_areas_id_fk" FOREIGN KEY ("area_id") REFERENCES "public"."areas"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lp_cylinders" ADD CONSTRAINT "lp_cylinders_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lp_cylinders" ADD CONSTRAINT "lp_cylinders_area_id_areas_id_fk" FOREIGN KEY ("area_id") REFERENCES "public"."areas"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lp_cylinders" ADD CONSTRAINT "lp_cylinders_current_truck_id_trucks_id_fk" FOREIGN KEY ("current_truck_id") REFERENCES "public"."trucks"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trucks" ADD CONSTRAINT "trucks_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trucks" ADD CONSTRAINT "trucks_home_area_id_areas_id_fk" FOREIGN KEY ("home_area_id") REFERENCES "public"."areas"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "asset_holds" ADD CONSTRAINT "asset_holds_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "asset_holds" ADD CONSTRAINT "asset_holds_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "battery_swaps" ADD CONSTRAINT "battery_swaps_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "battery_swaps" ADD CONSTRAINT "battery_swaps_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "battery_swaps" ADD CONSTRAINT "battery_swaps_truck_id_trucks_id_fk" FOREIGN KEY ("truck_id") REFERENCES "public"."trucks"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "battery_swaps" ADD CONSTRAINT "battery_swaps_battery_out_id_batteries_id_fk" FOREIGN KEY ("battery_out_id") REFERENCES "public"."batteries"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "battery_swaps" ADD CONSTRAINT "battery_swaps_battery_in_id_batteries_id_fk" FOREIGN KEY ("battery_in_id") REFERENCES "public"."batteries"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "battery_swaps" ADD CONSTRAINT "battery_swaps_corrects_id_battery_swaps_id_fk" FOREIGN KEY ("corrects_id") REFERENCES "public"."battery_swaps"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cell_readings" ADD CONSTRAINT "cell_readings_check_id_electrolyte_checks_id_fk" FOREIGN KEY ("check_id") REFERENCES "public"."electrolyte_checks"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "charge_sessions" ADD CONSTRAINT "charge_sessions_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "charge_sessions" ADD CONSTRAINT "charge_sessions_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "charge_sessions" ADD CONSTRAINT "charge_sessions_battery_id_batteries_id_fk" FOREIGN KEY ("battery_id") REFERENCES "public"."batteries"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "charge_sessions" ADD CONSTRAINT "charge_sessions_charger_id_chargers_id_fk" FOREIGN KEY ("charger_id") REFERENCES "public"."chargers"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "charge_sessions" ADD CONSTRAINT "charge_sessions_ended_by_users_id_fk" FOREIGN KEY ("ended_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "charge_sessions" ADD CONSTRAINT "charge_sessions_corrects_id_charge_sessions_id_fk" FOREIGN KEY ("corrects_id") REFERENCES "public"."charge_sessions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "electrolyte_checks" ADD CONSTRAINT "electrolyte_checks_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "electrolyte_checks" ADD CONSTRAINT "electrolyte_checks_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "electrolyte_checks" ADD CONSTRAINT "electrolyte_checks_battery_id_batteries_id_fk" FOREIGN KEY ("battery_id") REFERENCES "public"."batteries"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "electrolyte_checks" ADD CONSTRAINT "electrolyte_checks_corrects_id_electrolyte_checks_id_fk" FOREIGN KEY ("corrects_id") REFERENCES "public"."electrolyte_checks"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "co_readings" ADD CONSTRAINT "co_readings_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "co_readings" ADD CONSTRAINT "co_readings_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "co_readings" ADD CONSTRAINT "co_readings_area_id_areas_id_fk" FOREIGN KEY ("area_id") REFERENCES "public"."areas"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cylinder_exchanges" ADD CONSTRAINT "cylinder_exchanges_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cylinder_exchanges" ADD CONSTRAINT "cylinder_exchanges_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cylinder_exchanges" ADD CONSTRAINT "cylinder_exchanges_truck_id_trucks_id_fk" FOREIGN KEY ("truck_id") REFERENCES "public"."trucks"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cylinder_exchanges" ADD CONSTRAINT "cylinder_exchanges_cylinder_off_id_lp_cylinders_id_fk" FOREIGN KEY ("cylinder_off_id") REFERENCES "public"."lp_cylinders"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cylinder_exchanges" ADD CONSTRAINT "cylinder_exchanges_cylinder_on_id_lp_cylinders_id_fk" FOREIGN KEY ("cylinder_on_id") REFERENCES "public"."lp_cylinders"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cylinder_exchanges" ADD CONSTRAINT "cylinder_exchanges_corrects_id_cylinder_exchanges_id_fk" FOREIGN KEY ("corrects_id") REFERENCES "public"."cylinder_exchanges"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cylinder_refills" ADD CONSTRAINT "cylinder_refills_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cylinder_refills" ADD CONSTRAINT "cylinder_refills_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cylinder_refills" ADD CONSTRAINT "cylinder_refills_cylinder_id_lp_cylinders_id_fk" FOREIGN KEY ("cylinder_id") REFERENCES "public"."lp_cylinders"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cylinder_refills" ADD CONSTRAINT "cylinder_refills_corrects_id_cylinder_refills_id_fk" FOREIGN KEY ("corrects_id") REFERENCES "public"."cylinder_refills"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "emissions_tests" ADD CONSTRAINT "emissions_tests_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "emissions_tests" ADD CONSTRAINT "emissions_tests_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "emissions_tests" ADD CONSTRAINT "emissions_tests_truck_id_trucks_id_fk" FOREIGN KEY ("truck_id") REFERENCES "public"."trucks"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "emissions_tests" ADD CONSTRAINT "emissions_tests_certificate_upload_id_uploads_id_fk" FOREIGN KEY ("certificate_upload_id") REFERENCES "public"."uploads"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "emissions_tests" ADD CONSTRAINT "emissions_tests_corrects_id_emissions_tests_id_fk" FOREIGN KEY ("corrects_id") REFERENCES "public"."emissions_tests"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "requalifications" ADD CONSTRAINT "requalifications_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "requalifications" ADD CONSTRAINT "requalifications_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "requalifications" ADD CONSTRAINT "requalifications_cylinder_id_lp_cylinders_id_fk" FOREIGN KEY ("cylinder_id") REFERENCES "public"."lp_cylinders"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "area_log_entries" ADD CONSTRAINT "area_log_entries_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "area_log_entries" ADD CONSTRAINT "area_log_entries_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "area_log_entries" ADD CONSTRAINT "area_log_entries_log_id_area_logs_id_fk" FOREIGN KEY ("log_id") REFERENCES "public"."area_logs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "area_log_entries" ADD CONSTRAINT "area_log_entries_corrects_id_area_log_entries_id_fk" FOREIGN KEY ("corrects_id") REFERENCES "public"."area_log_entries"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "area_logs" ADD CONSTRAINT "area_logs_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "area_logs" ADD CONSTRAINT "area_logs_area_id_areas_id_fk" FOREIGN KEY ("area_id") REFERENCES "public"."areas"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "area_logs" ADD CONSTRAINT "area_logs_template_id_checklist_templates_id_fk" FOREIGN KEY ("template_id") REFERENCES "public"."checklist_templates"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "area_logs" ADD CONSTRAINT "area_logs_signed_by_users_id_fk" FOREIGN KEY ("signed_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calendar_feeds" ADD CONSTRAINT "calendar_feeds_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "checklist_templates" ADD CONSTRAINT "checklist_templates_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "follow_ups" ADD CONSTRAINT "follow_ups_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "follow_ups" ADD CONSTRAINT "follow_ups_owner_user_id_users_id_fk" FOREIGN KEY ("owner_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "follow_ups" ADD CONSTRAINT "follow_ups_closed_by_users_id_fk" FOREIGN KEY ("closed_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "incidents" ADD CONSTRAINT "incidents_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "incidents" ADD CONSTRAINT "incidents_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "incidents" ADD CONSTRAINT "incidents_area_id_areas_id_fk" FOREIGN KEY ("area_id") REFERENCES "public"."areas"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "incidents" ADD CONSTRAINT "incidents_follow_up_owner_id_users_id_fk" FOREIGN KEY ("follow_up_owner_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "mail_messages" ADD CONSTRAINT "mail_messages_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "schedules" ADD CONSTRAINT "schedules_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "uploads" ADD CONSTRAINT "uploads_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "uploads" ADD CONSTRAINT "uploads_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "areas_site_id_kind_index" ON "areas" USING btree ("site_id","kind");--> statement-breakpoint
CREATE UNIQUE INDEX "areas_site_id_name_index" ON "areas" USING btree ("site_id","name");--> statement-breakpoint
CREATE INDEX "audit_log_entity_entity_id_at_index" ON "audit_log" USING btree ("entity","entity_id","at");--> statement-breakpoint
CREATE INDEX "audit_log_site_id_at_index" ON "audit_log" USING btree ("site_id","at");--> statement-breakpoint
CREATE INDEX "audit_log_user_id_index" ON "audit_log" USING btree ("user_id");--> statement-breakpoint
CREATE UNIQUE INDEX "memberships_user_id_site_id_role_index" ON "memberships" USING btree ("user_id","site_id","role");--> statement-breakpoint
CREATE INDEX "memberships_site_id_role_index" ON "memberships" USING btree ("site_id","role");--> statement-breakpoint
CREATE INDEX "qualifications_user_id_kind_index" ON "qualifications" USING btree ("user_id","kind");--> statement-breakpoint
CREATE INDEX "qualifications_expires_on_index" ON "qualifications" USING btree ("expires_on");--> statement-breakpoint
CREATE INDEX "sign_in_failures_key_at_index" ON "sign_in_failures" USING btree ("key","at");--> statement-breakpoint
CREATE INDEX "sites_organization_id_index" ON "sites" USING btree ("organization_id");--> statement-breakpoint
CREATE UNIQUE INDEX "sites_organization_id_name_index" ON "sites" USING btree ("organization_id","name");--> statement-breakpoint
CREATE UNIQUE INDEX "tags_code_index" ON "tags" USING btree ("code");--> statement-breakpoint
CREATE INDEX "tags_asset_kind_asset_id_index" ON "tags" USING btree ("asset_kind","asset_id");--> statement-breakpoint
CREATE INDEX "tags_site_id_index" ON "tags" USING btree ("site_id");--> statement-breakpoint
CREATE UNIQUE INDEX "tags_one_live_per_asset" ON "tags" USING btree ("asset_kind","asset_id") WHERE "tags"."retired_at" IS NULL;--> statement-breakpoint
CREATE UNIQUE INDEX "users_email_lower_idx" ON "users" USING btree (lower("email"));--> statement-breakpoint
CREATE UNIQUE INDEX "batteries_site_id_serial_index" ON "batteries" USING btree ("site_id","serial");--> statement-breakpoint
CREATE INDEX "batteries_site_id_chemistry_index" ON "batteries" USING btree ("site_id","chemistry");--> statement-breakpoint
CREATE INDEX "batteries_site_id_voltage_index" ON "batteries" USING btree ("site_id","voltage");--> statement-breakpoint
CREATE INDEX "batteries_home_area_id_index" ON "batteries" USING btree ("home_area_id");--> statement-breakpoint
CREATE UNIQUE INDEX "batteries_one_per_truck" ON "batteries" USING btree ("current_truck_id") WHERE "batteries"."current_truck_id" IS NOT NULL;--> statement-breakpoint
CREATE UNIQUE INDEX "chargers_site_id_name_index" ON "chargers" USING btree ("site_id","name");--> statement-breakpoint
CREATE INDEX "chargers_area_id_index" ON "chargers" USING btree ("area_id");--> statement-breakpoint
CREATE UNIQUE INDEX "lp_cylinders_site_id_serial_index" ON "lp_cylinders" USING btree ("site_id","serial");--> statement-breakpoint
CREATE INDEX "lp_cylinders_site_id_status_index" ON "lp_cylinders" USING btree ("site_id","status");--> statement-breakpoint
CREATE INDEX "lp_cylinders_area_id_status_index" ON "lp_cylinders" USING btree ("area_id","status");--> statement-breakpoint
CREATE UNIQUE INDEX "cylinders_one_per_truck" ON "lp_cylinders" USING btree ("current_truck_id") WHERE "lp_cylinders"."current_truck_id" IS NOT NULL;--> statement-breakpoint
CREATE UNIQUE INDEX "trucks_site_id_fleet_number_index" ON "trucks" USING btree ("site_id","fleet_number");--> statement-breakpoint
CREATE INDEX "trucks_site_id_power_index" ON "trucks" USING btree ("site_id","power");--> statement-breakpoint
CREATE INDEX "trucks_home_area_id_index" ON "trucks" USING btree ("home_area_id");--> statement-breakpoint
CREATE INDEX "asset_holds_asset_kind_asset_id_at_index" ON "asset_holds" USING btree ("asset_kind","asset_id","at");--> statement-breakpoint
CREATE INDEX "asset_holds_site_id_at_index" ON "asset_holds" USING btree ("site_id","at");--> statement-breakpoint
CREATE INDEX "battery_swaps_site_id_at_index" ON "battery_swaps" USING btree ("site_id","at");--> statement-breakpoint
CREATE INDEX "battery_swaps_truck_id_at_index" ON "battery_swaps" USING btree ("truck_id","at");--> statement-breakpoint
CREATE INDEX "battery_swaps_battery_in_id_at_index" ON "battery_swaps" USING btree ("battery_in_id","at");--> statement-breakpoint
CREATE INDEX "battery_swaps_battery_out_id_at_index" ON "battery_swaps" USING btree ("battery_out_id","at");--> statement-breakpoint
CREATE INDEX "battery_swaps_user_id_index" ON "battery_swaps" USING btree ("user_id");--> statement-breakpoint
CREATE UNIQUE INDEX "battery_swaps_idem" ON "battery_swaps" USING btree ("idempotency_key") WHERE "battery_swaps"."idempotency_key" IS NOT NULL;--> statement-breakpoint
CREATE INDEX "charge_sessions_site_id_at_index" ON "charge_sessions" USING btree ("site_id","at");--> statement-breakpoint
CREATE INDEX "charge_sessions_battery_id_at_index" ON "charge_sessions" USING btree ("battery_id","at");--> statement-breakpoint
CREATE INDEX "charge_sessions_charger_id_at_index" ON "charge_sessions" USING btree ("charger_id","at");--> statement-breakpoint
CREATE UNIQUE INDEX "charge_sessions_open_battery" ON "charge_sessions" USING btree ("battery_id") WHERE "charge_sessions"."ended_at" IS NULL AND "charge_sessions"."corrects_id" IS NULL;--> statement-breakpoint
CREATE UNIQUE INDEX "charge_sessions_open_charger" ON "charge_sessions" USING btree ("charger_id") WHERE "charge_sessions"."ended_at" IS NULL AND "charge_sessions"."corrects_id" IS NULL;--> statement-breakpoint
CREATE UNIQUE INDEX "charge_sessions_idem" ON "charge_sessions" USING btree ("idempotency_key") WHERE "charge_sessions"."idempotency_key" IS NOT NULL;--> statement-breakpoint
CREATE INDEX "electrolyte_checks_site_id_at_index" ON "electrolyte_checks" USING btree ("site_id","at");--> statement-breakpoint
CREATE INDEX "electrolyte_checks_battery_id_at_index" ON "electrolyte_checks" USING btree ("battery_id","at");--> statement-breakpoint
CREATE UNIQUE INDEX "electrolyte_checks_idem" ON "electrolyte_checks" USING btree ("idempotency_key") WHERE "electrolyte_checks"."idempotency_key" IS NOT NULL;--> statement-breakpoint
CREATE INDEX "co_readings_area_id_taken_on_index" ON "co_readings" USING btree ("area_id","taken_on");--> statement-breakpoint
CREATE INDEX "co_readings_site_id_taken_on_index" ON "co_readings" USING btree ("site_id","taken_on");--> statement-breakpoint
CREATE INDEX "cylinder_exchanges_site_id_at_index" ON "cylinder_exchanges" USING btree ("site_id","at");--> statement-breakpoint
CREATE INDEX "cylinder_exchanges_truck_id_at_index" ON "cylinder_exchanges" USING btree ("truck_id","at");--> statement-breakpoint
CREATE INDEX "cylinder_exchanges_cylinder_on_id_index" ON "cylinder_exchanges" USING btree ("cylinder_on_id");--> statement-breakpoint
CREATE INDEX "cylinder_exchanges_cylinder_off_id_index" ON "cylinder_exchanges" USING btree ("cylinder_off_id");--> statement-breakpoint
CREATE UNIQUE INDEX "cylinder_exchanges_idem" ON "cylinder_exchanges" USING btree ("idempotency_key") WHERE "cylinder_exchanges"."idempotency_key" IS NOT NULL;--> statement-breakpoint
CREATE INDEX "cylinder_refills_site_id_at_index" ON "cylinder_refills" USING btree ("site_id","at");--> statement-breakpoint
CREATE INDEX "cylinder_refills_cylinder_id_at_index" ON "cylinder_refills" USING btree ("cylinder_id","at");--> statement-breakpoint
CREATE UNIQUE INDEX "cylinder_refills_idem" ON "cylinder_refills" USING btree ("idempotency_key") WHERE "cylinder_refills"."idempotency_key" IS NOT NULL;--> statement-breakpoint
CREATE INDEX "emissions_tests_truck_id_tested_on_index" ON "emissions_tests" USING btree ("truck_id","tested_on");--> statement-breakpoint
CREATE INDEX "emissions_tests_site_id_next_due_on_index" ON "emissions_tests" USING btree ("site_id","next_due_on");--> statement-breakpoint
CREATE INDEX "requalifications_cylinder_id_performed_on_index" ON "requalifications" USING btree ("cylinder_id","performed_on");--> statement-breakpoint
CREATE INDEX "requalifications_site_id_index" ON "requalifications" USING btree ("site_id");--> statement-breakpoint
CREATE INDEX "area_log_entries_log_id_item_key_index" ON "area_log_entries" USING btree ("log_id","item_key");--> statement-breakpoint
CREATE INDEX "area_log_entries_site_id_at_index" ON "area_log_entries" USING btree ("site_id","at");--> statement-breakpoint
CREATE UNIQUE INDEX "area_log_entries_idem" ON "area_log_entries" USING btree ("idempotency_key") WHERE "area_log_entries"."idempotency_key" IS NOT NULL;--> statement-breakpoint
CREATE UNIQUE INDEX "area_logs_area_id_template_id_period_start_index" ON "area_logs" USING btree ("area_id","template_id","period_start");--> statement-breakpoint
CREATE INDEX "area_logs_site_id_period_start_index" ON "area_logs" USING btree ("site_id","period_start");--> statement-breakpoint
CREATE UNIQUE INDEX "calendar_feeds_token_hash_index" ON "calendar_feeds" USING btree ("token_hash");--> statement-breakpoint
CREATE INDEX "calendar_feeds_user_id_index" ON "calendar_feeds" USING btree ("user_id");--> statement-breakpoint
CREATE INDEX "checklist_templates_site_id_area_kind_cadence_index" ON "checklist_templates" USING btree ("site_id","area_kind","cadence");--> statement-breakpoint
CREATE INDEX "follow_ups_site_id_closed_at_index" ON "follow_ups" USING btree ("site_id","closed_at");--> statement-breakpoint
CREATE INDEX "follow_ups_source_source_id_index" ON "follow_ups" USING btree ("source","source_id");--> statement-breakpoint
CREATE INDEX "follow_ups_owner_user_id_index" ON "follow_ups" USING btree ("owner_user_id");--> statement-breakpoint
CREATE INDEX "incidents_site_id_at_index" ON "incidents" USING btree ("site_id","at");--> statement-breakpoint
CREATE INDEX "incidents_area_id_index" ON "incidents" USING btree ("area_id");--> statement-breakpoint
CREATE INDEX "incidents_asset_kind_asset_id_index" ON "incidents" USING btree ("asset_kind","asset_id");--> statement-breakpoint
CREATE INDEX "mail_messages_status_next_attempt_at_index" ON "mail_messages" USING btree ("status","next_attempt_at");--> statement-breakpoint
CREATE INDEX "mail_messages_site_id_created_at_index" ON "mail_messages" USING btree ("site_id","created_at");--> statement-breakpoint
CREATE UNIQUE INDEX "schedules_site_id_kind_index" ON "schedules" USING btree ("site_id","kind");--> statement-breakpoint
CREATE INDEX "schedules_site_id_active_index" ON "schedules" USING btree ("site_id","active");--> statement-breakpoint
CREATE UNIQUE INDEX "uploads_storage_key_index" ON "uploads" USING btree ("storage_key");--> statement-breakpoint
CREATE INDEX "uploads_site_id_index" ON "uploads" USING btree ("site_id");