import { NextResponse } from "next/server";
import { sql } from "drizzle-orm";
import { getDatabaseHandle } from "@/db/client";

export const dynamic = "force-dynamic";

/** Liveness and readiness: answers only once the database is open and migrated. */
export async function GET() {
  try {
    const { db, kind } = await getDatabaseHandle();
    await db.execute(sql`select 1`);
    return NextResponse.json({ status: "ok", database: kind });
  } catch (err) {
    console.error("[health] database unavailable", err);
    return NextResponse.json({ status: "unavailable", error: { message: "The database is not available." } }, { status: 503 });
  }
}
