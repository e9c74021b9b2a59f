import { defineRoute, jsonError } from "@/lib/server/route";

/** Unknown API paths answer in the API's own error shape, not with an HTML page. */
const notFound = defineRoute({ outsideProject: "public" }, async ({ req }) =>
  jsonError(404, `There is no API at ${req.nextUrl.pathname}. The API lives under /api/auth, /api/health and /api/v1.`),
);

export { notFound as GET, notFound as POST, notFound as PUT, notFound as PATCH, notFound as DELETE };
