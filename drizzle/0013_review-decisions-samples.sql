CREATE TYPE "public"."sample_item_kind" AS ENUM('outlet', 'terminal_unit', 'section');--> statement-breakpoint
CREATE TYPE "public"."sample_status" AS ENUM('open', 'closed');--> statement-breakpoint
CREATE TABLE "verification_sample_items" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"sample_id" uuid NOT NULL,
	"position" integer NOT NULL,
	"kind" "sample_item_kind" NOT NULL,
	"terminal_id" uuid,
	"section_id" uuid,
	"tag" text NOT NULL,
	"technician_reading_id" uuid,
	"technician_traverse_id" uuid,
	"technician_flow_m3_s" double precision,
	"technician_conditions_id" uuid,
	"agent_method" text,
	"agent_detail" jsonb,
	"agent_flow_m3_s" double precision,
	"agent_conditions_id" uuid,
	"conditions_differ" jsonb,
	"difference_pct" double precision,
	"agrees" boolean,
	"witnessed" boolean DEFAULT false NOT NULL,
	"read_by" uuid,
	"read_at" timestamp with time zone,
	CONSTRAINT "verification_sample_items_one_item" CHECK (("verification_sample_items"."terminal_id" is null) <> ("verification_sample_items"."section_id" is null))
);
--> statement-breakpoint
CREATE TABLE "verification_samples" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"project_id" uuid NOT NULL,
	"system_id" uuid NOT NULL,
	"seed" bigint NOT NULL,
	"sample_pct" double precision NOT NULL,
	"min_count" integer NOT NULL,
	"tolerance_pct" double precision NOT NULL,
	"allowed_failures" integer NOT NULL,
	"population" jsonb NOT NULL,
	"status" "sample_status" DEFAULT 'open' NOT NULL,
	"agreed_count" integer DEFAULT 0 NOT NULL,
	"disagreed_count" integer DEFAULT 0 NOT NULL,
	"recommend_return" boolean DEFAULT false NOT NULL,
	"drawn_by" uuid,
	"drawn_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "reviews" ALTER COLUMN "traverse_id" DROP NOT NULL;--> statement-breakpoint
ALTER TABLE "projects" ADD COLUMN "sample_pct" double precision DEFAULT 10 NOT NULL;--> statement-breakpoint
ALTER TABLE "projects" ADD COLUMN "sample_min_count" integer DEFAULT 3 NOT NULL;--> statement-breakpoint
ALTER TABLE "projects" ADD COLUMN "sample_tolerance_pct" double precision DEFAULT 10 NOT NULL;--> statement-breakpoint
ALTER TABLE "projects" ADD COLUMN "sample_allowed_failures" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "reviews" ADD COLUMN "terminal_set_id" uuid;--> statement-breakpoint
ALTER TABLE "reviews" ADD COLUMN "system_wide" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "verification_sample_items" ADD CONSTRAINT "verification_sample_items_sample_id_verification_samples_id_fk" FOREIGN KEY ("sample_id") REFERENCES "public"."verification_samples"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "verification_sample_items" ADD CONSTRAINT "verification_sample_items_terminal_id_terminals_id_fk" FOREIGN KEY ("terminal_id") REFERENCES "public"."terminals"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "verification_sample_items" ADD CONSTRAINT "verification_sample_items_section_id_duct_sections_id_fk" FOREIGN KEY ("section_id") REFERENCES "public"."duct_sections"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "verification_sample_items" ADD CONSTRAINT "verification_sample_items_technician_reading_id_terminal_readings_id_fk" FOREIGN KEY ("technician_reading_id") REFERENCES "public"."terminal_readings"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "verification_sample_items" ADD CONSTRAINT "verification_sample_items_technician_traverse_id_traverses_id_fk" FOREIGN KEY ("technician_traverse_id") REFERENCES "public"."traverses"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "verification_sample_items" ADD CONSTRAINT "verification_sample_items_technician_conditions_id_operating_conditions_id_fk" FOREIGN KEY ("technician_conditions_id") REFERENCES "public"."operating_conditions"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "verification_sample_items" ADD CONSTRAINT "verification_sample_items_agent_conditions_id_operating_conditions_id_fk" FOREIGN KEY ("agent_conditions_id") REFERENCES "public"."operating_conditions"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "verification_sample_items" ADD CONSTRAINT "verification_sample_items_read_by_users_id_fk" FOREIGN KEY ("read_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "verification_samples" ADD CONSTRAINT "verification_samples_project_id_projects_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."projects"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "verification_samples" ADD CONSTRAINT "verification_samples_system_id_air_systems_id_fk" FOREIGN KEY ("system_id") REFERENCES "public"."air_systems"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "verification_samples" ADD CONSTRAINT "verification_samples_drawn_by_users_id_fk" FOREIGN KEY ("drawn_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "verification_sample_items_position_idx" ON "verification_sample_items" USING btree ("sample_id","position");--> statement-breakpoint
CREATE INDEX "verification_samples_system_idx" ON "verification_samples" USING btree ("system_id","drawn_at");--> statement-breakpoint
ALTER TABLE "reviews" ADD CONSTRAINT "reviews_terminal_set_id_terminal_sets_id_fk" FOREIGN KEY ("terminal_set_id") REFERENCES "public"."terminal_sets"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "reviews_terminal_set_idx" ON "reviews" USING btree ("terminal_set_id");--> statement-breakpoint
ALTER TABLE "projects" ADD CONSTRAINT "projects_sample_range" CHECK ("projects"."sample_pct" > 0 and "projects"."sample_pct" <= 100 and "projects"."sample_min_count" between 1 and 500 and "projects"."sample_tolerance_pct" > 0 and "projects"."sample_tolerance_pct" <= 50 and "projects"."sample_allowed_failures" between 0 and 500);--> statement-breakpoint
ALTER TABLE "reviews" ADD CONSTRAINT "reviews_one_item" CHECK (("reviews"."traverse_id" is null) <> ("reviews"."terminal_set_id" is null));