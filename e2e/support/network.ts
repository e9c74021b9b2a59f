import type { BrowserContext, Route } from "@playwright/test";

/**
 * Takes the browser off the network the way a plant room does. `context.setOffline` does not reach
 * requests a service worker makes in Chromium, so those are refused here too: the page then sees
 * exactly what a tablet without signal sees, service worker included.
 */
async function refuseServiceWorkerRequests(route: Route) {
  if (route.request().serviceWorker()) await route.abort("internetdisconnected");
  else await route.fallback();
}

export async function goOffline(context: BrowserContext) {
  await context.setOffline(true);
  await context.route("**/*", refuseServiceWorkerRequests);
}

export async function goOnline(context: BrowserContext) {
  await context.unroute("**/*", refuseServiceWorkerRequests);
  await context.setOffline(false);
}
