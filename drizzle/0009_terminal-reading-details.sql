CREATE TYPE "public"."velocity_basis" AS ENUM('actual', 'standard');--> statement-breakpoint
ALTER TABLE "terminal_readings" ADD COLUMN "velocity_basis" "velocity_basis";--> statement-breakpoint
ALTER TABLE "terminal_readings" ADD COLUMN "traverse_version" integer;--> statement-breakpoint
ALTER TABLE "terminal_readings" ADD COLUMN "relative_humidity_pct" double precision;--> statement-breakpoint
ALTER TABLE "terminal_readings" ADD COLUMN "barometric_pa" double precision;--> statement-breakpoint
ALTER TABLE "terminal_readings" ADD COLUMN "density_kg_m3" double precision;--> statement-breakpoint
ALTER TABLE "terminal_readings" ADD COLUMN "controller_flow_factor" double precision;--> statement-breakpoint
ALTER TABLE "terminal_readings" ADD COLUMN "air_instrument_id" uuid;--> statement-breakpoint
ALTER TABLE "terminal_readings" ADD CONSTRAINT "terminal_readings_air_instrument_id_instruments_id_fk" FOREIGN KEY ("air_instrument_id") REFERENCES "public"."instruments"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "terminal_sets_one_open_idx" ON "terminal_sets" USING btree ("system_id") WHERE "terminal_sets"."status" in ('draft', 'returned');