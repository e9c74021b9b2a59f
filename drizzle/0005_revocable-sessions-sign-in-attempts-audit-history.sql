CREATE TYPE "public"."sign_in_outcome" AS ENUM('pending', 'failed', 'succeeded', 'throttled', 'cleared');--> statement-breakpoint
CREATE TABLE "sign_in_attempts" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"email" text NOT NULL,
	"client" text NOT NULL,
	"outcome" "sign_in_outcome" DEFAULT 'pending' NOT NULL
);
--> statement-breakpoint
ALTER TABLE "audit_log" DROP CONSTRAINT "audit_log_user_id_users_id_fk";
--> statement-breakpoint
ALTER TABLE "audit_log" DROP CONSTRAINT "audit_log_project_id_projects_id_fk";
--> statement-breakpoint
ALTER TABLE "audit_log" ADD COLUMN "actor_email" text;--> statement-breakpoint
ALTER TABLE "users" ADD COLUMN "session_version" integer DEFAULT 1 NOT NULL;--> statement-breakpoint
CREATE INDEX "sign_in_attempts_email_idx" ON "sign_in_attempts" USING btree ("email","at");--> statement-breakpoint
CREATE INDEX "sign_in_attempts_client_idx" ON "sign_in_attempts" USING btree ("client","at");--> statement-breakpoint
CREATE INDEX "sign_in_attempts_at_idx" ON "sign_in_attempts" USING btree ("at");