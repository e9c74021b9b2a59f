DROP TABLE "terminal_readings" CASCADE;--> statement-breakpoint
ALTER TABLE "projects" DROP COLUMN "terminal_tolerance_pct";--> statement-breakpoint
ALTER TABLE "projects" DROP COLUMN "section_tolerance_pct";--> statement-breakpoint
ALTER TABLE "projects" DROP COLUMN "fan_tolerance_pct";--> statement-breakpoint
ALTER TABLE "terminals" DROP COLUMN "kind";--> statement-breakpoint
DROP TYPE "public"."reading_phase";--> statement-breakpoint
DROP TYPE "public"."terminal_kind";