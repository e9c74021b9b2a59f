import { NextResponse, type NextRequest } from "next/server";

/**
 * Every page request gets a fresh nonce and a Content-Security-Policy that allows only scripts
 * carrying it (Next.js reads the policy from the request header and puts the nonce on its own
 * scripts; 'strict-dynamic' lets those load the app's chunks). Pages therefore render per request
 * (app/layout.tsx asks for the connection), never from a static cache that would reuse a nonce.
 */
function contentSecurityPolicy(nonce: string, https: boolean): string {
  const dev = process.env.NODE_ENV === "development";
  return [
    "default-src 'self'",
    // React's development build evaluates code for its error overlay; production never does.
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${dev ? " 'unsafe-eval'" : ""}`,
    // 'unsafe-inline' for styles only: React renders `style={…}` props as style attributes
    // (indents in the duct tree, chart sizes), and a nonce cannot cover an attribute. Style
    // attributes cannot run script; scripts stay nonce-only. Charts draw on <canvas> and set
    // sizes through the CSSOM, which the policy does not restrict.
    "style-src 'self' 'unsafe-inline'",
    // Images come from our own routes only (photo and certificate thumbnails behind the session).
    "img-src 'self'",
    "font-src 'self'",
    "connect-src 'self'",
    "worker-src 'self' blob:",
    "manifest-src 'self'",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
    ...(https ? ["upgrade-insecure-requests"] : []),
  ].join("; ");
}

export function proxy(request: NextRequest) {
  const nonce = Buffer.from(crypto.randomUUID()).toString("base64");
  // Served over HTTPS in production; the demo runs the production build on plain http://localhost.
  const https = process.env.NODE_ENV === "production" && process.env.AIRTALLY_DEMO !== "1";
  const csp = contentSecurityPolicy(nonce, https);

  const requestHeaders = new Headers(request.headers);
  requestHeaders.set("x-nonce", nonce);
  requestHeaders.set("Content-Security-Policy", csp);
  const response = NextResponse.next({ request: { headers: requestHeaders } });
  response.headers.set("Content-Security-Policy", csp);
  if (https) response.headers.set("Strict-Transport-Security", "max-age=63072000; includeSubDomains");
  return response;
}

export const config = {
  matcher: [
    {
      // Pages only: the API sets its own headers (lib/server/route.ts), static files need no nonce.
      source: "/((?!api/|_next/static|_next/image|favicon.ico|icon.svg|fonts/).*)",
      missing: [
        { type: "header", key: "next-router-prefetch" },
        { type: "header", key: "purpose", value: "prefetch" },
      ],
    },
  ],
};
