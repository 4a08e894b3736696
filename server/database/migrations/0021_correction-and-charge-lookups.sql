DROP INDEX "battery_swaps_corrected_once";--> statement-breakpoint
DROP INDEX "charge_sessions_corrected_once";--> statement-breakpoint
DROP INDEX "electrolyte_checks_corrected_once";--> statement-breakpoint
DROP INDEX "co_readings_corrected_once";--> statement-breakpoint
DROP INDEX "cylinder_exchanges_corrected_once";--> statement-breakpoint
DROP INDEX "cylinder_refills_corrected_once";--> statement-breakpoint
DROP INDEX "emissions_tests_corrected_once";--> statement-breakpoint
DROP INDEX "requalifications_corrected_once";--> statement-breakpoint
CREATE INDEX "charge_sessions_open_by_battery" ON "charge_sessions" USING btree ("battery_id","at") WHERE "charge_sessions"."ended_at" IS NULL;--> statement-breakpoint
CREATE INDEX "charge_sessions_cycles_by_battery" ON "charge_sessions" USING btree ("battery_id","id") WHERE "charge_sessions"."counted_cycle";--> statement-breakpoint
CREATE UNIQUE INDEX "battery_swaps_corrected_once" ON "battery_swaps" USING btree ("corrects_id") WHERE "battery_swaps"."corrects_id" IS NOT NULL;--> statement-breakpoint
CREATE UNIQUE INDEX "charge_sessions_corrected_once" ON "charge_sessions" USING btree ("corrects_id") WHERE "charge_sessions"."corrects_id" IS NOT NULL;--> statement-breakpoint
CREATE UNIQUE INDEX "electrolyte_checks_corrected_once" ON "electrolyte_checks" USING btree ("corrects_id") WHERE "electrolyte_checks"."corrects_id" IS NOT NULL;--> statement-breakpoint
CREATE UNIQUE INDEX "co_readings_corrected_once" ON "co_readings" USING btree ("corrects_id") WHERE "co_readings"."corrects_id" IS NOT NULL;--> statement-breakpoint
CREATE UNIQUE INDEX "cylinder_exchanges_corrected_once" ON "cylinder_exchanges" USING btree ("corrects_id") WHERE "cylinder_exchanges"."corrects_id" IS NOT NULL;--> statement-breakpoint
CREATE UNIQUE INDEX "cylinder_refills_corrected_once" ON "cylinder_refills" USING btree ("corrects_id") WHERE "cylinder_refills"."corrects_id" IS NOT NULL;--> statement-breakpoint
CREATE UNIQUE INDEX "emissions_tests_corrected_once" ON "emissions_tests" USING btree ("corrects_id") WHERE "emissions_tests"."corrects_id" IS NOT NULL;--> statement-breakpoint
CREATE UNIQUE INDEX "requalifications_corrected_once" ON "requalifications" USING btree ("corrects_id") WHERE "requalifications"."corrects_id" IS NOT NULL;