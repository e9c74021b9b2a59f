import { NextResponse } from "next/server";
import { openApiDocument } from "@/lib/openapi";
import { defineRoute } from "@/lib/server/route";

/** The API description, generated from the zod schemas the routes validate with. Public: it holds no data. */
export const GET = defineRoute({ outsideProject: "public" }, async () => NextResponse.json(openApiDocument()));
