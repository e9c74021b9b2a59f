ALTER TABLE "readings" ALTER COLUMN "value" DROP NOT NULL;--> statement-breakpoint
ALTER TABLE "readings" ADD COLUMN "unreadable" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "traverses" ADD COLUMN "probe_head_diameter_mm" double precision;--> statement-breakpoint
ALTER TABLE "traverses" ADD COLUMN "instrument_accuracy" jsonb DEFAULT '{}'::jsonb NOT NULL;--> statement-breakpoint
ALTER TABLE "traverses" ADD COLUMN "instrument_standard_density_kg_m3" double precision;--> statement-breakpoint
ALTER TABLE "traverses" ADD COLUMN "barometer_instrument_id" uuid;--> statement-breakpoint
ALTER TABLE "traverses" ADD CONSTRAINT "traverses_barometer_instrument_id_instruments_id_fk" FOREIGN KEY ("barometer_instrument_id") REFERENCES "public"."instruments"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "traverses_section_revision_idx" ON "traverses" USING btree ("section_id","revision");--> statement-breakpoint
ALTER TABLE "readings" ADD CONSTRAINT "readings_value_or_unreadable" CHECK (("readings"."unreadable" and "readings"."value" is null) or (not "readings"."unreadable" and "readings"."value" is not null));--> statement-breakpoint
ALTER TABLE "traverses" ADD CONSTRAINT "traverses_version_positive" CHECK ("traverses"."version" >= 1);