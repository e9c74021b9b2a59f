CREATE TYPE "public"."duct_shape" AS ENUM('round', 'rectangular');--> statement-breakpoint
CREATE TYPE "public"."member_role" AS ENUM('technician', 'commissioning_agent', 'engineer', 'owner');--> statement-breakpoint
CREATE TYPE "public"."reading_phase" AS ENUM('as_found', 'as_left');--> statement-breakpoint
CREATE TYPE "public"."readings_kind" AS ENUM('velocity_pressure', 'velocity_actual', 'velocity_standard');--> statement-breakpoint
CREATE TYPE "public"."review_decision" AS ENUM('approved', 'returned');--> statement-breakpoint
CREATE TYPE "public"."section_kind" AS ENUM('trunk', 'branch');--> statement-breakpoint
CREATE TYPE "public"."system_kind" AS ENUM('supply', 'return', 'exhaust', 'outside_air');--> statement-breakpoint
CREATE TYPE "public"."terminal_kind" AS ENUM('supply', 'return', 'exhaust');--> statement-breakpoint
CREATE TYPE "public"."traverse_method" AS ENUM('equal-area', 'log-linear');--> statement-breakpoint
CREATE TYPE "public"."traverse_status" AS ENUM('draft', 'submitted', 'approved', 'returned');--> statement-breakpoint
CREATE TYPE "public"."unit_system" AS ENUM('IP', 'SI');--> statement-breakpoint
CREATE TABLE "air_systems" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"project_id" uuid NOT NULL,
	"tag" text NOT NULL,
	"name" text NOT NULL,
	"kind" "system_kind" NOT NULL,
	"design_flow_m3_s" double precision NOT NULL,
	"design_static_pa" double precision,
	"fan_speed_rpm" double precision,
	"location" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "audit_log" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"user_id" uuid,
	"project_id" uuid,
	"action" text NOT NULL,
	"entity_type" text NOT NULL,
	"entity_id" text,
	"detail" jsonb DEFAULT '{}'::jsonb NOT NULL
);
--> statement-breakpoint
CREATE TABLE "duct_sections" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"system_id" uuid NOT NULL,
	"parent_id" uuid,
	"tag" text NOT NULL,
	"kind" "section_kind" NOT NULL,
	"shape" "duct_shape" NOT NULL,
	"diameter_mm" double precision,
	"width_mm" double precision,
	"height_mm" double precision,
	"design_flow_m3_s" double precision NOT NULL,
	"straight_upstream_mm" double precision,
	"straight_downstream_mm" double precision,
	"location" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "duct_sections_dimensions" CHECK (("duct_sections"."shape" = 'round' and coalesce("duct_sections"."diameter_mm", 0) > 0) or ("duct_sections"."shape" = 'rectangular' and coalesce("duct_sections"."width_mm", 0) > 0 and coalesce("duct_sections"."height_mm", 0) > 0))
);
--> statement-breakpoint
CREATE TABLE "project_members" (
	"project_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"role" "member_role" NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "project_members_project_id_user_id_pk" PRIMARY KEY("project_id","user_id")
);
--> statement-breakpoint
CREATE TABLE "projects" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"site_name" text NOT NULL,
	"address" text DEFAULT '' NOT NULL,
	"altitude_m" double precision DEFAULT 0 NOT NULL,
	"unit_system" "unit_system" DEFAULT 'SI' NOT NULL,
	"standard_density_kg_m3" double precision DEFAULT 1.204 NOT NULL,
	"terminal_tolerance_pct" double precision DEFAULT 10 NOT NULL,
	"section_tolerance_pct" double precision DEFAULT 10 NOT NULL,
	"fan_tolerance_pct" double precision DEFAULT 5 NOT NULL,
	"continuity_tolerance_pct" double precision DEFAULT 10 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "projects_density_range" CHECK ("projects"."standard_density_kg_m3" between 0.5 and 2),
	CONSTRAINT "projects_altitude_range" CHECK ("projects"."altitude_m" between -500 and 5000)
);
--> statement-breakpoint
CREATE TABLE "readings" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"traverse_id" uuid NOT NULL,
	"line" integer NOT NULL,
	"point" integer NOT NULL,
	"value" double precision NOT NULL,
	"recorded_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "reviews" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"traverse_id" uuid NOT NULL,
	"reviewer_id" uuid NOT NULL,
	"decision" "review_decision" NOT NULL,
	"reason" text DEFAULT '' NOT NULL,
	"witnessed" boolean DEFAULT false NOT NULL,
	"traverse_version" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "terminal_readings" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"terminal_id" uuid NOT NULL,
	"phase" "reading_phase" NOT NULL,
	"flow_m3_s" double precision NOT NULL,
	"instrument" text DEFAULT '' NOT NULL,
	"taken_by" uuid,
	"taken_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "terminals" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"section_id" uuid NOT NULL,
	"tag" text NOT NULL,
	"kind" "terminal_kind" NOT NULL,
	"device" text DEFAULT '' NOT NULL,
	"room" text DEFAULT '' NOT NULL,
	"design_flow_m3_s" double precision NOT NULL,
	"effective_area_m2" double precision,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "traverses" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"section_id" uuid NOT NULL,
	"method" "traverse_method" NOT NULL,
	"lines" integer NOT NULL,
	"points_per_line" integer NOT NULL,
	"readings_kind" "readings_kind" DEFAULT 'velocity_pressure' NOT NULL,
	"instrument" text DEFAULT '' NOT NULL,
	"instrument_serial" text DEFAULT '' NOT NULL,
	"probe_coefficient" double precision DEFAULT 1 NOT NULL,
	"dry_bulb_c" double precision,
	"wet_bulb_c" double precision,
	"relative_humidity_pct" double precision,
	"barometric_pa" double precision,
	"static_pa" double precision,
	"port_offset_mm" double precision DEFAULT 0 NOT NULL,
	"status" "traverse_status" DEFAULT 'draft' NOT NULL,
	"version" integer DEFAULT 1 NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"taken_by" uuid,
	"taken_at" timestamp with time zone,
	"submitted_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "traverses_counts" CHECK ("traverses"."lines" >= 1 and "traverses"."points_per_line" >= 2)
);
--> statement-breakpoint
CREATE TABLE "users" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"email" text NOT NULL,
	"name" text NOT NULL,
	"password_hash" text NOT NULL,
	"is_admin" boolean DEFAULT false NOT NULL,
	"unit_system" "unit_system",
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "air_systems" ADD CONSTRAINT "air_systems_project_id_projects_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."projects"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audit_log" ADD CONSTRAINT "audit_log_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audit_log" ADD CONSTRAINT "audit_log_project_id_projects_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."projects"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "duct_sections" ADD CONSTRAINT "duct_sections_system_id_air_systems_id_fk" FOREIGN KEY ("system_id") REFERENCES "public"."air_systems"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "duct_sections" ADD CONSTRAINT "duct_sections_parent_id_duct_sections_id_fk" FOREIGN KEY ("parent_id") REFERENCES "public"."duct_sections"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "project_members" ADD CONSTRAINT "project_members_project_id_projects_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."projects"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "project_members" ADD CONSTRAINT "project_members_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "readings" ADD CONSTRAINT "readings_traverse_id_traverses_id_fk" FOREIGN KEY ("traverse_id") REFERENCES "public"."traverses"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reviews" ADD CONSTRAINT "reviews_traverse_id_traverses_id_fk" FOREIGN KEY ("traverse_id") REFERENCES "public"."traverses"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reviews" ADD CONSTRAINT "reviews_reviewer_id_users_id_fk" FOREIGN KEY ("reviewer_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "terminal_readings" ADD CONSTRAINT "terminal_readings_terminal_id_terminals_id_fk" FOREIGN KEY ("terminal_id") REFERENCES "public"."terminals"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "terminal_readings" ADD CONSTRAINT "terminal_readings_taken_by_users_id_fk" FOREIGN KEY ("taken_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "terminals" ADD CONSTRAINT "terminals_section_id_duct_sections_id_fk" FOREIGN KEY ("section_id") REFERENCES "public"."duct_sections"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "traverses" ADD CONSTRAINT "traverses_section_id_duct_sections_id_fk" FOREIGN KEY ("section_id") REFERENCES "public"."duct_sections"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "traverses" ADD CONSTRAINT "traverses_taken_by_users_id_fk" FOREIGN KEY ("taken_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "air_systems_project_tag_idx" ON "air_systems" USING btree ("project_id","tag");--> statement-breakpoint
CREATE INDEX "audit_log_project_idx" ON "audit_log" USING btree ("project_id","at");--> statement-breakpoint
CREATE UNIQUE INDEX "duct_sections_system_tag_idx" ON "duct_sections" USING btree ("system_id","tag");--> statement-breakpoint
CREATE INDEX "duct_sections_parent_idx" ON "duct_sections" USING btree ("parent_id");--> statement-breakpoint
CREATE INDEX "project_members_user_idx" ON "project_members" USING btree ("user_id");--> statement-breakpoint
CREATE UNIQUE INDEX "readings_position_idx" ON "readings" USING btree ("traverse_id","line","point");--> statement-breakpoint
CREATE INDEX "reviews_traverse_idx" ON "reviews" USING btree ("traverse_id");--> statement-breakpoint
CREATE INDEX "terminal_readings_terminal_idx" ON "terminal_readings" USING btree ("terminal_id");--> statement-breakpoint
CREATE INDEX "terminals_section_idx" ON "terminals" USING btree ("section_id");--> statement-breakpoint
CREATE INDEX "traverses_section_idx" ON "traverses" USING btree ("section_id");--> statement-breakpoint
CREATE UNIQUE INDEX "users_email_lower_idx" ON "users" USING btree (lower("email"));