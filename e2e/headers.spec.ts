import { expect, test, type Page } from "@playwright/test";
import { DEMO_PASSWORD, SignInPage } from "./pages/sign-in-page";

/** Collects every CSP violation a page reports, from the DOM event and from the console. */
async function watchCsp(page: Page): Promise<string[]> {
  const violations: string[] = [];
  page.on("console", (msg) => {
    if (/Content Security Policy|Refused to (load|execute|apply|connect)/i.test(msg.text())) violations.push(`console: ${msg.text()}`);
  });
  await page.exposeFunction("__reportCsp", (v: string) => violations.push(v));
  await page.addInitScript(() => {
    document.addEventListener("securitypolicyviolation", (e) => {
      (window as unknown as { __reportCsp(v: string): void }).__reportCsp(`${e.violatedDirective} blocked ${e.blockedURI || "inline"} at ${location.pathname}`);
    });
  });
  return violations;
}

test("pages carry a nonce-based Content-Security-Policy, a fresh nonce each time, on the framework's scripts too", async ({ request }) => {
  const first = await request.get("/sign-in");
  const csp = first.headers()["content-security-policy"]!;
  for (const directive of ["default-src 'self'", "object-src 'none'", "base-uri 'self'", "form-action 'self'", "frame-ancestors 'none'", "'strict-dynamic'"]) {
    expect(csp).toContain(directive);
  }
  expect(csp).not.toMatch(/script-src[^;]*'unsafe-inline'/);
  const nonce = /'nonce-([^']+)'/.exec(csp)![1]!;
  const html = await first.text();
  expect(html).toContain(`nonce="${nonce}"`);
  const second = await request.get("/sign-in");
  expect(/'nonce-([^']+)'/.exec(second.headers()["content-security-policy"]!)![1]).not.toBe(nonce);
  // Plain HTTP (the demo): no HSTS, which browsers ignore there anyway; production over HTTPS sends it (tests/server/proxy.test.ts).
  expect(first.headers()["strict-transport-security"]).toBeUndefined();
});

const ACCOUNTS = ["tech@example.test", "cx@example.test", "engineer@example.test", "owner@example.test", "admin@example.test"];

for (const email of ACCOUNTS) {
  test(`no screen ${email} can open breaks the policy`, async ({ page }) => {
    // A dozen screens, each to network idle: three times the default time.
    test.slow();
    const violations = await watchCsp(page);
    const signIn = new SignInPage(page);
    await signIn.goto();
    await signIn.signIn(email);
    await expect(page).toHaveURL(/\/projects$/);
    await page.getByRole("link", { name: /Wrenfield Library/ }).click();
    const nav = page.getByRole("navigation", { name: "Project" });
    await expect(nav).toBeVisible();
    const tabs = await nav.getByRole("link").all();
    const hrefs = await Promise.all(tabs.map((t) => t.getAttribute("href")));
    // The header's own screens too: instruments, notifications, the outbox for site administrators.
    const header = await page.getByRole("navigation", { name: "Main" }).getByRole("link").all();
    hrefs.push(...(await Promise.all(header.map((t) => t.getAttribute("href")))));
    for (const href of hrefs) {
      await page.goto(href!);
      await expect(page.getByRole("main").first()).toBeVisible();
      // Client navigation and hydration too: the unit switch re-renders with React.
      await page.waitForLoadState("networkidle");
    }
    // One instrument's own page, with its calibration certificate.
    await page.goto("/instruments");
    await page.getByRole("table").getByRole("link").first().click();
    await expect(page.getByRole("heading", { name: "Calibration certificate" })).toBeVisible();
    await page.waitForLoadState("networkidle");
    await page.goto("/sign-out");
    await page.goto("/projects/00000000-0000-4000-8000-000000000000");
    await page.waitForLoadState("networkidle");
    expect(violations).toEqual([]);
  });
}

test("the public screens (report verification, an invitation link) break no policy", async ({ page, playwright, baseURL }) => {
  // The verification code of the report issued before the run (e2e/support/prepare-data.ts).
  const api = await playwright.request.newContext({ baseURL });
  expect((await api.post("/api/auth/sign-in", { data: { email: "owner@example.test", password: DEMO_PASSWORD } })).status()).toBe(204);
  const { projects } = (await (await api.get("/api/v1/projects")).json()) as { projects: { id: string; name: string }[] };
  const library = projects.find((p) => p.name.startsWith("Wrenfield Library"))!;
  const { reports } = (await (await api.get(`/api/v1/projects/${library.id}/reports`)).json()) as { reports: { code: string }[] };
  await api.dispose();

  const violations = await watchCsp(page);
  for (const path of ["/verify", `/verify/${reports[0]!.code}`, "/invite/not-an-invitation-link"]) {
    await page.goto(path);
    await expect(page.getByRole("main").first()).toBeVisible();
    await page.waitForLoadState("networkidle");
  }
  expect(violations).toEqual([]);
});

test("the sign-in screen and a failed sign-in break no policy", async ({ page }) => {
  const violations = await watchCsp(page);
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("not-an-address", "x");
  await expect(page.getByText("That is not an e-mail address.")).toBeVisible();
  expect(violations).toEqual([]);
});
