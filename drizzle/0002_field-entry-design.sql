CREATE TYPE "public"."air_service" AS ENUM('supply', 'return', 'exhaust', 'outside_air');--> statement-breakpoint
CREATE TYPE "public"."box_override" AS ENUM('none', 'maximum', 'minimum', 'mixed');--> statement-breakpoint
CREATE TYPE "public"."filter_state" AS ENUM('clean', 'part_loaded', 'loaded', 'unknown');--> statement-breakpoint
CREATE TYPE "public"."instrument_kind" AS ENUM('manometer', 'pitot_tube', 'capture_hood', 'thermal_anemometer', 'vane_anemometer', 'tachometer', 'clamp_meter', 'thermo_hygrometer', 'barometer');--> statement-breakpoint
CREATE TYPE "public"."terminal_reading_method" AS ENUM('hood', 'velocity_area', 'traverse');--> statement-breakpoint
CREATE TYPE "public"."terminal_reading_phase" AS ENUM('initial', 'final');--> statement-breakpoint
CREATE TYPE "public"."terminal_setpoint" AS ENUM('design', 'maximum', 'minimum', 'heating');--> statement-breakpoint
CREATE TYPE "public"."terminal_type" AS ENUM('diffuser', 'grille', 'register', 'vav_box', 'constant_volume_box');--> statement-breakpoint
CREATE TABLE "instruments" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"kind" "instrument_kind" NOT NULL,
	"make" text DEFAULT '' NOT NULL,
	"model" text DEFAULT '' NOT NULL,
	"serial" text NOT NULL,
	"calibrated_on" date,
	"calibration_due_on" date,
	"range_min" double precision,
	"range_max" double precision,
	"accuracy_pct" double precision,
	"accuracy_floor" double precision,
	"probe_coefficient" double precision,
	"probe_head_diameter_mm" double precision,
	"hood_correction_factor" double precision,
	"notes" text DEFAULT '' NOT NULL,
	"retired_at" timestamp with time zone,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "operating_conditions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"system_id" uuid NOT NULL,
	"fan_speed_rpm" double precision,
	"vfd_hz" double precision,
	"boxes" "box_override" DEFAULT 'none' NOT NULL,
	"outside_air_damper_pct" double precision,
	"duct_static_setpoint_pa" double precision,
	"filter_state" "filter_state" DEFAULT 'unknown' NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"recorded_by" uuid,
	"recorded_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "terminal_sets" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"system_id" uuid NOT NULL,
	"status" "traverse_status" DEFAULT 'draft' NOT NULL,
	"version" integer DEFAULT 1 NOT NULL,
	"revision" integer DEFAULT 1 NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"submitted_by" uuid,
	"submitted_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "air_systems" ADD COLUMN "design_outside_air_m3_s" double precision;--> statement-breakpoint
ALTER TABLE "air_systems" ADD COLUMN "motor_power_kw" double precision;--> statement-breakpoint
ALTER TABLE "air_systems" ADD COLUMN "motor_speed_rpm" double precision;--> statement-breakpoint
ALTER TABLE "air_systems" ADD COLUMN "motor_full_load_amps" double precision;--> statement-breakpoint
ALTER TABLE "air_systems" ADD COLUMN "motor_volts" double precision;--> statement-breakpoint
ALTER TABLE "air_systems" ADD COLUMN "motor_phases" integer;--> statement-breakpoint
ALTER TABLE "air_systems" ADD COLUMN "motor_service_factor" double precision;--> statement-breakpoint
ALTER TABLE "air_systems" ADD COLUMN "has_vfd" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "projects" ADD COLUMN "fan_tolerance_minus_pct" double precision DEFAULT 5 NOT NULL;--> statement-breakpoint
ALTER TABLE "projects" ADD COLUMN "fan_tolerance_plus_pct" double precision DEFAULT 5 NOT NULL;--> statement-breakpoint
ALTER TABLE "projects" ADD COLUMN "section_tolerance_minus_pct" double precision DEFAULT 10 NOT NULL;--> statement-breakpoint
ALTER TABLE "projects" ADD COLUMN "section_tolerance_plus_pct" double precision DEFAULT 10 NOT NULL;--> statement-breakpoint
ALTER TABLE "projects" ADD COLUMN "outlet_tolerance_minus_pct" double precision DEFAULT 10 NOT NULL;--> statement-breakpoint
ALTER TABLE "projects" ADD COLUMN "outlet_tolerance_plus_pct" double precision DEFAULT 10 NOT NULL;--> statement-breakpoint
ALTER TABLE "projects" ADD COLUMN "terminal_unit_tolerance_minus_pct" double precision DEFAULT 10 NOT NULL;--> statement-breakpoint
ALTER TABLE "projects" ADD COLUMN "terminal_unit_tolerance_plus_pct" double precision DEFAULT 10 NOT NULL;--> statement-breakpoint
ALTER TABLE "projects" ADD COLUMN "outside_air_tolerance_minus_pct" double precision DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "projects" ADD COLUMN "outside_air_tolerance_plus_pct" double precision DEFAULT 10 NOT NULL;--> statement-breakpoint
ALTER TABLE "terminals" ADD COLUMN "type" "terminal_type" DEFAULT 'diffuser' NOT NULL;--> statement-breakpoint
ALTER TABLE "terminals" ADD COLUMN "service" "air_service" DEFAULT 'supply' NOT NULL;--> statement-breakpoint
ALTER TABLE "terminals" ADD COLUMN "size_shape" "duct_shape";--> statement-breakpoint
ALTER TABLE "terminals" ADD COLUMN "diameter_mm" double precision;--> statement-breakpoint
ALTER TABLE "terminals" ADD COLUMN "width_mm" double precision;--> statement-breakpoint
ALTER TABLE "terminals" ADD COLUMN "height_mm" double precision;--> statement-breakpoint
ALTER TABLE "terminals" ADD COLUMN "design_min_flow_m3_s" double precision;--> statement-breakpoint
ALTER TABLE "terminals" ADD COLUMN "design_heating_flow_m3_s" double precision;--> statement-breakpoint
ALTER TABLE "terminals" ADD COLUMN "controller_flow_factor" double precision;--> statement-breakpoint
ALTER TABLE "traverses" ADD COLUMN "instrument_id" uuid;--> statement-breakpoint
ALTER TABLE "traverses" ADD COLUMN "probe_instrument_id" uuid;--> statement-breakpoint
ALTER TABLE "traverses" ADD COLUMN "air_instrument_id" uuid;--> statement-breakpoint
ALTER TABLE "traverses" ADD COLUMN "overdue_reason" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "traverses" ADD COLUMN "conditions_id" uuid;--> statement-breakpoint
ALTER TABLE "traverses" ADD COLUMN "revision" integer DEFAULT 1 NOT NULL;--> statement-breakpoint
ALTER TABLE "instruments" ADD CONSTRAINT "instruments_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "operating_conditions" ADD CONSTRAINT "operating_conditions_system_id_air_systems_id_fk" FOREIGN KEY ("system_id") REFERENCES "public"."air_systems"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "operating_conditions" ADD CONSTRAINT "operating_conditions_recorded_by_users_id_fk" FOREIGN KEY ("recorded_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "terminal_sets" ADD CONSTRAINT "terminal_sets_system_id_air_systems_id_fk" FOREIGN KEY ("system_id") REFERENCES "public"."air_systems"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "terminal_sets" ADD CONSTRAINT "terminal_sets_submitted_by_users_id_fk" FOREIGN KEY ("submitted_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "instruments_kind_serial_idx" ON "instruments" USING btree ("kind",lower("serial"));--> statement-breakpoint
CREATE INDEX "operating_conditions_system_idx" ON "operating_conditions" USING btree ("system_id","recorded_at");--> statement-breakpoint
CREATE INDEX "terminal_sets_system_idx" ON "terminal_sets" USING btree ("system_id");--> statement-breakpoint
ALTER TABLE "traverses" ADD CONSTRAINT "traverses_instrument_id_instruments_id_fk" FOREIGN KEY ("instrument_id") REFERENCES "public"."instruments"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "traverses" ADD CONSTRAINT "traverses_probe_instrument_id_instruments_id_fk" FOREIGN KEY ("probe_instrument_id") REFERENCES "public"."instruments"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "traverses" ADD CONSTRAINT "traverses_air_instrument_id_instruments_id_fk" FOREIGN KEY ("air_instrument_id") REFERENCES "public"."instruments"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "traverses" ADD CONSTRAINT "traverses_conditions_id_operating_conditions_id_fk" FOREIGN KEY ("conditions_id") REFERENCES "public"."operating_conditions"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "terminals_section_tag_idx" ON "terminals" USING btree ("section_id","tag");--> statement-breakpoint
ALTER TABLE "projects" ADD CONSTRAINT "projects_tolerance_range" CHECK (least("projects"."fan_tolerance_minus_pct", "projects"."fan_tolerance_plus_pct", "projects"."section_tolerance_minus_pct", "projects"."section_tolerance_plus_pct", "projects"."outlet_tolerance_minus_pct", "projects"."outlet_tolerance_plus_pct", "projects"."terminal_unit_tolerance_minus_pct", "projects"."terminal_unit_tolerance_plus_pct", "projects"."outside_air_tolerance_minus_pct", "projects"."outside_air_tolerance_plus_pct", "projects"."continuity_tolerance_pct") >= 0 and greatest("projects"."fan_tolerance_minus_pct", "projects"."fan_tolerance_plus_pct", "projects"."section_tolerance_minus_pct", "projects"."section_tolerance_plus_pct", "projects"."outlet_tolerance_minus_pct", "projects"."outlet_tolerance_plus_pct", "projects"."terminal_unit_tolerance_minus_pct", "projects"."terminal_unit_tolerance_plus_pct", "projects"."outside_air_tolerance_minus_pct", "projects"."outside_air_tolerance_plus_pct", "projects"."continuity_tolerance_pct") <= 100);--> statement-breakpoint
-- Carry the old symmetric tolerances and each terminal's direction over before the old columns go.
UPDATE "projects" SET "fan_tolerance_minus_pct" = "fan_tolerance_pct", "fan_tolerance_plus_pct" = "fan_tolerance_pct",
  "section_tolerance_minus_pct" = "section_tolerance_pct", "section_tolerance_plus_pct" = "section_tolerance_pct",
  "outlet_tolerance_minus_pct" = "terminal_tolerance_pct", "outlet_tolerance_plus_pct" = "terminal_tolerance_pct";--> statement-breakpoint
UPDATE "terminals" SET "service" = "kind"::text::"air_service", "type" = CASE WHEN "kind" = 'supply' THEN 'diffuser'::"terminal_type" ELSE 'grille'::"terminal_type" END;
