import { NextResponse } from "next/server";
import { sql } from "drizzle-orm";
import { getDatabaseHandle } from "@/db/client";
import { defineRoute } from "@/lib/server/route";

export const dynamic = "force-dynamic";

/**
 * Liveness and readiness: answers only once the database is open and migrated. Anyone learns that
 * the service is up; which database it runs on is for signed-in site administrators.
 */
export const GET = defineRoute({ outsideProject: "public" }, async ({ getUser }) => {
  let kind: string;
  try {
    const handle = await getDatabaseHandle();
    await handle.db.execute(sql`select 1`);
    kind = handle.kind;
  } catch (err) {
    console.error("[health] database unavailable", err);
    return NextResponse.json({ status: "unavailable", error: { message: "The database is not available." } }, { status: 503 });
  }
  const user = await getUser();
  return NextResponse.json(user?.isAdmin ? { status: "ok", database: kind } : { status: "ok" });
});
