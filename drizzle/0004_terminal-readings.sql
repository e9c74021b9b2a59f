CREATE TABLE "terminal_readings" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"terminal_id" uuid NOT NULL,
	"set_id" uuid NOT NULL,
	"phase" "terminal_reading_phase" NOT NULL,
	"method" "terminal_reading_method" NOT NULL,
	"setpoint" "terminal_setpoint" DEFAULT 'design' NOT NULL,
	"hood_flow_m3_s" double precision,
	"hood_correction_factor" double precision,
	"hood_density_corrected" boolean,
	"hood_back_pressure_compensated" boolean,
	"velocities_m_s" jsonb,
	"effective_area_m2" double precision,
	"traverse_id" uuid,
	"dry_bulb_c" double precision,
	"flow_m3_s" double precision NOT NULL,
	"standard_flow_m3_s" double precision NOT NULL,
	"controller_flow_m3_s" double precision,
	"damper_marked" boolean DEFAULT false NOT NULL,
	"conditions_id" uuid,
	"instrument_id" uuid,
	"overdue_reason" text DEFAULT '' NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"taken_by" uuid,
	"taken_at" timestamp with time zone DEFAULT now() NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "terminal_readings" ADD CONSTRAINT "terminal_readings_terminal_id_terminals_id_fk" FOREIGN KEY ("terminal_id") REFERENCES "public"."terminals"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "terminal_readings" ADD CONSTRAINT "terminal_readings_set_id_terminal_sets_id_fk" FOREIGN KEY ("set_id") REFERENCES "public"."terminal_sets"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "terminal_readings" ADD CONSTRAINT "terminal_readings_traverse_id_traverses_id_fk" FOREIGN KEY ("traverse_id") REFERENCES "public"."traverses"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "terminal_readings" ADD CONSTRAINT "terminal_readings_conditions_id_operating_conditions_id_fk" FOREIGN KEY ("conditions_id") REFERENCES "public"."operating_conditions"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "terminal_readings" ADD CONSTRAINT "terminal_readings_instrument_id_instruments_id_fk" FOREIGN KEY ("instrument_id") REFERENCES "public"."instruments"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "terminal_readings" ADD CONSTRAINT "terminal_readings_taken_by_users_id_fk" FOREIGN KEY ("taken_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "terminal_readings_terminal_idx" ON "terminal_readings" USING btree ("terminal_id","taken_at");--> statement-breakpoint
CREATE INDEX "terminal_readings_set_idx" ON "terminal_readings" USING btree ("set_id");