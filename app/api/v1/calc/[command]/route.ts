import { NextResponse } from "next/server";
import { runCalcCommand } from "@/lib/airflow/commands";
import { defineRoute, jsonError, readJson } from "@/lib/server/route";

/** The engine over HTTP: the same commands, input and output as `npm run calc`. */
export const POST = defineRoute({}, async ({ req, params }) => {
  const raw = await readJson(req);
  if (!raw.ok) return jsonError(400, raw.message, { "(body)": raw.message });
  const result = runCalcCommand(params.command ?? "", raw.value);
  if (!result.ok) return NextResponse.json({ error: result.error }, { status: 400 });
  return NextResponse.json(result.value);
});
