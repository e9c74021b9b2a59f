import { NextResponse } from "next/server";
import { openApiDocument } from "@/lib/openapi";

/** The API description, generated from the zod schemas the routes validate with. Public: it holds no data. */
export function GET() {
  return NextResponse.json(openApiDocument(), { headers: { "cache-control": "public, max-age=300" } });
}
