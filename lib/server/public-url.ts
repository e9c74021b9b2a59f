/** The address people reach this deployment at, for links in e-mails and on reports (AIRTALLY_PUBLIC_URL). */
export function publicBaseUrl(): string {
  const configured = process.env.AIRTALLY_PUBLIC_URL?.trim().replace(/\/+$/, "");
  return configured || `http://localhost:${process.env.PORT || "3000"}`;
}

/** An absolute URL for a path of this app ("/projects/…"). */
export function publicUrl(pathname: string): string {
  return publicBaseUrl() + (pathname.startsWith("/") ? pathname : `/${pathname}`);
}
