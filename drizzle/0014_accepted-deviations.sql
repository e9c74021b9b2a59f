CREATE TYPE "public"."deviation_subject" AS ENUM('section', 'terminal', 'junction', 'system');--> statement-breakpoint
CREATE TABLE "accepted_deviations" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"project_id" uuid NOT NULL,
	"subject" "deviation_subject" NOT NULL,
	"entity_id" uuid NOT NULL,
	"measure" text NOT NULL,
	"label" text NOT NULL,
	"accepted_value" double precision NOT NULL,
	"value_unit" text NOT NULL,
	"tolerance" text NOT NULL,
	"reason" text NOT NULL,
	"accepted_by" uuid,
	"accepted_by_name" text NOT NULL,
	"accepted_at" timestamp with time zone DEFAULT now() NOT NULL,
	"withdrawn_by" uuid,
	"withdrawn_by_name" text,
	"withdrawn_at" timestamp with time zone,
	"withdraw_reason" text,
	CONSTRAINT "accepted_deviations_reason" CHECK (length("accepted_deviations"."reason") between 1 and 2000),
	CONSTRAINT "accepted_deviations_withdrawal" CHECK (("accepted_deviations"."withdrawn_at" is null and "accepted_deviations"."withdraw_reason" is null) or ("accepted_deviations"."withdrawn_at" is not null and length(coalesce("accepted_deviations"."withdraw_reason", '')) between 1 and 2000))
);
--> statement-breakpoint
ALTER TABLE "accepted_deviations" ADD CONSTRAINT "accepted_deviations_project_id_projects_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."projects"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "accepted_deviations" ADD CONSTRAINT "accepted_deviations_accepted_by_users_id_fk" FOREIGN KEY ("accepted_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "accepted_deviations" ADD CONSTRAINT "accepted_deviations_withdrawn_by_users_id_fk" FOREIGN KEY ("withdrawn_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "accepted_deviations_project_idx" ON "accepted_deviations" USING btree ("project_id","accepted_at");--> statement-breakpoint
CREATE UNIQUE INDEX "accepted_deviations_one_standing_idx" ON "accepted_deviations" USING btree ("project_id","subject","entity_id","measure") WHERE "accepted_deviations"."withdrawn_at" is null;