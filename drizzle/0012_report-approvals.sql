CREATE TABLE "report_approvals" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"project_id" uuid NOT NULL,
	"user_id" uuid,
	"name" text NOT NULL,
	"role" "member_role" NOT NULL,
	"for_revision" integer NOT NULL,
	"fingerprint" text NOT NULL,
	"comment" text DEFAULT '' NOT NULL,
	"approved_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "report_approvals_role" CHECK ("report_approvals"."role" in ('commissioning_agent', 'engineer'))
);
--> statement-breakpoint
ALTER TABLE "report_approvals" ADD CONSTRAINT "report_approvals_project_id_projects_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."projects"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "report_approvals" ADD CONSTRAINT "report_approvals_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "report_approvals_project_idx" ON "report_approvals" USING btree ("project_id","approved_at");