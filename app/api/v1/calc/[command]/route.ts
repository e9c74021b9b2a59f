import { NextResponse } from "next/server";
import "@/lib/validation/zod-browser";
import { z } from "zod";
import { runCalcCommand } from "@/lib/airflow/commands";
import { defineRoute } from "@/lib/server/route";

/** The engine over HTTP: the same commands, input and output as `npm run calc`. The engine validates the document itself. */
export const POST = defineRoute({ outsideProject: "signed-in", body: z.unknown() }, async ({ params, body }) => {
  const result = runCalcCommand(params.command ?? "", body);
  if (!result.ok) return NextResponse.json({ error: result.error }, { status: 400 });
  return NextResponse.json(result.value);
});
