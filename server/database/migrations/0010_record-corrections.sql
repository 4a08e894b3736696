DROP INDEX "battery_swaps_corrects_id_index";--> statement-breakpoint
DROP INDEX "charge_sessions_corrects_id_index";--> statement-breakpoint
DROP INDEX "electrolyte_checks_corrects_id_index";--> statement-breakpoint
DROP INDEX "co_readings_corrects_id_index";--> statement-breakpoint
DROP INDEX "cylinder_exchanges_corrects_id_index";--> statement-breakpoint
DROP INDEX "cylinder_refills_corrects_id_index";--> statement-breakpoint
DROP INDEX "emissions_tests_corrects_id_index";--> statement-breakpoint
DROP INDEX "requalifications_corrects_id_index";--> statement-breakpoint
CREATE UNIQUE INDEX "battery_swaps_corrected_once" ON "battery_swaps" USING btree ("corrects_id");--> statement-breakpoint
CREATE UNIQUE INDEX "charge_sessions_corrected_once" ON "charge_sessions" USING btree ("corrects_id");--> statement-breakpoint
CREATE UNIQUE INDEX "electrolyte_checks_corrected_once" ON "electrolyte_checks" USING btree ("corrects_id");--> statement-breakpoint
CREATE UNIQUE INDEX "co_readings_corrected_once" ON "co_readings" USING btree ("corrects_id");--> statement-breakpoint
CREATE UNIQUE INDEX "co_readings_idem" ON "co_readings" USING btree ("idempotency_key") WHERE "co_readings"."idempotency_key" IS NOT NULL;--> statement-breakpoint
CREATE UNIQUE INDEX "cylinder_exchanges_corrected_once" ON "cylinder_exchanges" USING btree ("corrects_id");--> statement-breakpoint
CREATE UNIQUE INDEX "cylinder_refills_corrected_once" ON "cylinder_refills" USING btree ("corrects_id");--> statement-breakpoint
CREATE UNIQUE INDEX "emissions_tests_corrected_once" ON "emissions_tests" USING btree ("corrects_id");--> statement-breakpoint
CREATE UNIQUE INDEX "emissions_tests_idem" ON "emissions_tests" USING btree ("idempotency_key") WHERE "emissions_tests"."idempotency_key" IS NOT NULL;--> statement-breakpoint
CREATE UNIQUE INDEX "requalifications_corrected_once" ON "requalifications" USING btree ("corrects_id");--> statement-breakpoint
CREATE UNIQUE INDEX "requalifications_idem" ON "requalifications" USING btree ("idempotency_key") WHERE "requalifications"."idempotency_key" IS NOT NULL;