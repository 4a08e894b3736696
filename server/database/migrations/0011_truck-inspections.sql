CREATE TABLE "retraining_triggers" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"recorded_at" timestamp with time zone DEFAULT now() NOT NULL,
	"idempotency_key" text,
	"note" text DEFAULT '' NOT NULL,
	"person_id" uuid NOT NULL,
	"reason" text NOT NULL,
	"truck_class" smallint,
	"happened_on" date NOT NULL
);
--> statement-breakpoint
CREATE TABLE "truck_inspection_templates" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"power" "truck_power" NOT NULL,
	"title" text NOT NULL,
	"items" jsonb NOT NULL,
	"version" integer DEFAULT 1 NOT NULL,
	"active" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "truck_inspections" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"recorded_at" timestamp with time zone DEFAULT now() NOT NULL,
	"idempotency_key" text,
	"note" text DEFAULT '' NOT NULL,
	"truck_id" uuid NOT NULL,
	"template_id" uuid NOT NULL,
	"hour_meter" double precision,
	"answers" jsonb NOT NULL,
	"critical_failed" text[] DEFAULT '{}' NOT NULL,
	"failed_count" integer DEFAULT 0 NOT NULL
);
--> statement-breakpoint
CREATE TABLE "truck_returns" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"recorded_at" timestamp with time zone DEFAULT now() NOT NULL,
	"idempotency_key" text,
	"note" text DEFAULT '' NOT NULL,
	"truck_id" uuid NOT NULL,
	"inspection_id" uuid,
	"what_was_done" text NOT NULL
);
--> statement-breakpoint
ALTER TABLE "truck_status" ADD COLUMN "hold_inspection_id" uuid;--> statement-breakpoint
ALTER TABLE "truck_status" ADD COLUMN "hold_since" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "truck_status" ADD COLUMN "hold_by" uuid;--> statement-breakpoint
ALTER TABLE "truck_status" ADD COLUMN "hold_reason" text;--> statement-breakpoint
ALTER TABLE "retraining_triggers" ADD CONSTRAINT "retraining_triggers_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "retraining_triggers" ADD CONSTRAINT "retraining_triggers_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "retraining_triggers" ADD CONSTRAINT "retraining_triggers_person_id_users_id_fk" FOREIGN KEY ("person_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "truck_inspection_templates" ADD CONSTRAINT "truck_inspection_templates_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "truck_inspections" ADD CONSTRAINT "truck_inspections_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "truck_inspections" ADD CONSTRAINT "truck_inspections_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "truck_inspections" ADD CONSTRAINT "truck_inspections_truck_id_trucks_id_fk" FOREIGN KEY ("truck_id") REFERENCES "public"."trucks"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "truck_inspections" ADD CONSTRAINT "truck_inspections_template_id_truck_inspection_templates_id_fk" FOREIGN KEY ("template_id") REFERENCES "public"."truck_inspection_templates"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "truck_returns" ADD CONSTRAINT "truck_returns_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "truck_returns" ADD CONSTRAINT "truck_returns_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "truck_returns" ADD CONSTRAINT "truck_returns_truck_id_trucks_id_fk" FOREIGN KEY ("truck_id") REFERENCES "public"."trucks"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "truck_returns" ADD CONSTRAINT "truck_returns_inspection_id_truck_inspections_id_fk" FOREIGN KEY ("inspection_id") REFERENCES "public"."truck_inspections"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "retraining_triggers_person_id_happened_on_index" ON "retraining_triggers" USING btree ("person_id","happened_on");--> statement-breakpoint
CREATE INDEX "retraining_triggers_site_id_at_index" ON "retraining_triggers" USING btree ("site_id","at");--> statement-breakpoint
CREATE INDEX "retraining_triggers_user_id_index" ON "retraining_triggers" USING btree ("user_id");--> statement-breakpoint
CREATE UNIQUE INDEX "truck_inspection_templates_site_id_power_version_index" ON "truck_inspection_templates" USING btree ("site_id","power","version");--> statement-breakpoint
CREATE INDEX "truck_inspection_templates_site_id_power_active_index" ON "truck_inspection_templates" USING btree ("site_id","power","active");--> statement-breakpoint
CREATE INDEX "truck_inspections_truck_id_at_index" ON "truck_inspections" USING btree ("truck_id","at");--> statement-breakpoint
CREATE INDEX "truck_inspections_site_id_at_index" ON "truck_inspections" USING btree ("site_id","at");--> statement-breakpoint
CREATE UNIQUE INDEX "truck_inspections_idem" ON "truck_inspections" USING btree ("idempotency_key") WHERE "truck_inspections"."idempotency_key" IS NOT NULL;--> statement-breakpoint
CREATE INDEX "truck_inspections_user_id_index" ON "truck_inspections" USING btree ("user_id");--> statement-breakpoint
CREATE INDEX "truck_inspections_template_id_index" ON "truck_inspections" USING btree ("template_id");--> statement-breakpoint
CREATE INDEX "truck_returns_truck_id_at_index" ON "truck_returns" USING btree ("truck_id","at");--> statement-breakpoint
CREATE INDEX "truck_returns_site_id_at_index" ON "truck_returns" USING btree ("site_id","at");--> statement-breakpoint
CREATE INDEX "truck_returns_user_id_index" ON "truck_returns" USING btree ("user_id");--> statement-breakpoint
CREATE INDEX "truck_returns_inspection_id_index" ON "truck_returns" USING btree ("inspection_id");--> statement-breakpoint
DO $$
DECLARE
  t text;
BEGIN
  FOREACH t IN ARRAY ARRAY['truck_inspection_templates', 'truck_inspections', 'truck_returns', 'retraining_triggers'] LOOP
    EXECUTE format('CREATE TRIGGER %I AFTER INSERT ON %I REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION site_revisions_from_site_id()', t || '_revision_insert', t);
    EXECUTE format('CREATE TRIGGER %I AFTER UPDATE ON %I REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION site_revisions_from_site_id()', t || '_revision_update', t);
    EXECUTE format('CREATE TRIGGER %I AFTER DELETE ON %I REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION site_revisions_from_site_id()', t || '_revision_delete', t);
  END LOOP;
END $$;
