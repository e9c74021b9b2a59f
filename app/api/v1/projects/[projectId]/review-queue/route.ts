import { NextResponse } from "next/server";
import { defineRoute } from "@/lib/server/route";
import { reviewQueue } from "@/lib/server/review-queue";

/** The review queue: every section's current traverse and system's current terminal set that is submitted, returned or approved, with their numbers and last decision, and counts per status. Any member. */
export const GET = defineRoute({ project: { param: "projectId", action: "project.view" } }, async ({ access }) => NextResponse.json(await reviewQueue(access!.project)));
