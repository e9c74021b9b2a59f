import { expect, test, type Page } from "@playwright/test";
import { SignInPage } from "./pages/sign-in-page";

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
    for (const href of hrefs) {
      await page.goto(href!);
      await expect(page.getByRole("main").first()).toBeVisible();
      // Client navigation and hydration too: the unit switch re-renders with React.
      await page.waitForLoadState("networkidle");
    }
    await page.goto("/sign-out");
    await page.goto("/projects/00000000-0000-4000-8000-000000000000");
    await page.waitForLoadState("networkidle");
    expect(violations).toEqual([]);
  });
}

test("the sign-in screen and a failed sign-in break no policy", async ({ page }) => {
  const violations = await watchCsp(page);
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("not-an-address", "x");
  await expect(page.getByText("That is not an e-mail address.")).toBeVisible();
  expect(violations).toEqual([]);
});
