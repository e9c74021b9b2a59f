import { expect, test } from "@playwright/test";
import { DEMO_PASSWORD, SignInPage } from "./pages/sign-in-page";

const LIBRARY = "Wrenfield Library — air balance";
const CLINIC = "Marlow Quay Clinic — fit-out";

// Each role's project tabs: its own work, and not the others'.
const ROLES = [
  { email: "tech@example.test", role: "Technician", tabs: ["Overview", "Field work", "Reports", "Members"] },
  { email: "cx@example.test", role: "Commissioning agent", tabs: ["Overview", "Review", "Reports", "Members", "Activity"] },
  { email: "engineer@example.test", role: "Engineer of record", tabs: ["Overview", "Set-up", "Design vs measured", "Reports", "Members", "Activity"] },
  { email: "owner@example.test", role: "Owner", tabs: ["Overview", "Reports", "Members"] },
  { email: "admin@example.test", role: "Site administrator", tabs: ["Overview", "Set-up", "Design vs measured", "Reports", "Members", "Activity"] },
];
const ALL_TABS = ["Overview", "Set-up", "Field work", "Review", "Design vs measured", "Reports", "Members", "Activity"];

for (const account of ROLES) {
  test(`${account.role} signs in and sees their own navigation`, async ({ page }) => {
    const signIn = new SignInPage(page);
    await signIn.goto();
    await signIn.signIn(account.email);
    await expect(page).toHaveURL(/\/projects$/);
    await page.getByRole("link", { name: new RegExp(LIBRARY) }).click();
    await expect(page.getByRole("heading", { level: 1, name: LIBRARY })).toBeVisible();
    const nav = page.getByRole("navigation", { name: "Project" });
    await expect(nav.getByRole("link")).toHaveText(account.tabs);
    for (const tab of ALL_TABS.filter((t) => !account.tabs.includes(t))) {
      await expect(nav.getByRole("link", { name: tab, exact: true })).toHaveCount(0);
    }
    await expect(page.getByText(`Your role: ${account.role}`)).toBeVisible();
  });
}

test("a wrong password shows a clear error and sets no cookie", async ({ page, context }) => {
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("tech@example.test", "not-the-password");
  await expect(signIn.error()).toHaveText("That e-mail and password do not match an account.");
  await expect(page).toHaveURL(/\/sign-in$/);
  expect((await context.cookies()).filter((c) => c.name === "airtally_session")).toHaveLength(0);
});

test("a malformed e-mail is named beside its field", async ({ page }) => {
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("not-an-address", "x");
  await expect(page.getByText("That is not an e-mail address.")).toBeVisible();
});

test("signed-out requests are refused: 401 from the API, sign-in from pages", async ({ page, request }) => {
  const res = await request.get("/api/v1/projects");
  expect(res.status()).toBe(401);
  expect(await res.json()).toEqual({ error: { message: expect.any(String) } });
  await page.goto("/projects");
  await expect(page).toHaveURL(/\/sign-in$/);
});

test("each demo account gets a cookie from the API and sees the demo project with its role", async ({ playwright, baseURL }) => {
  const expected = {
    "tech@example.test": "technician",
    "cx@example.test": "commissioning_agent",
    "engineer@example.test": "engineer",
    "owner@example.test": "owner",
  } as const;
  for (const [email, role] of Object.entries(expected)) {
    const api = await playwright.request.newContext({ baseURL });
    const signIn = await api.post("/api/auth/sign-in", { data: { email, password: DEMO_PASSWORD } });
    expect(signIn.status()).toBe(204);
    const cookie = signIn.headers()["set-cookie"] ?? "";
    expect(cookie).toContain("airtally_session=");
    expect(cookie.toLowerCase()).toContain("httponly");
    expect(cookie.toLowerCase()).toContain("samesite=lax");
    const body = (await (await api.get("/api/v1/projects")).json()) as { projects: { name: string; role: string }[] };
    expect(body.projects.find((p) => p.name === LIBRARY)?.role).toBe(role);
    const me = await (await api.get("/api/auth/me")).json();
    expect(me.user.email).toBe(email);
    expect((await api.post("/api/auth/sign-out")).status()).toBe(204);
    expect((await api.get("/api/v1/projects")).status()).toBe(401);
    await api.dispose();
  }
});

test("a user sees only the projects they belong to", async ({ playwright, baseURL, page }) => {
  const names = async (email: string) => {
    const api = await playwright.request.newContext({ baseURL });
    await api.post("/api/auth/sign-in", { data: { email, password: DEMO_PASSWORD } });
    const body = (await (await api.get("/api/v1/projects")).json()) as { projects: { name: string }[] };
    await api.dispose();
    return body.projects.map((p) => p.name).sort();
  };
  expect(await names("tech@example.test")).toEqual([LIBRARY]);
  expect(await names("engineer@example.test")).toEqual([CLINIC, LIBRARY].sort());

  // And the page of a project they are not in is not found.
  const api = await playwright.request.newContext({ baseURL });
  await api.post("/api/auth/sign-in", { data: { email: "engineer@example.test", password: DEMO_PASSWORD } });
  const all = (await (await api.get("/api/v1/projects")).json()) as { projects: { id: string; name: string }[] };
  const clinicId = all.projects.find((p) => p.name === CLINIC)!.id;
  await api.dispose();
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("tech@example.test");
  await expect(page).toHaveURL(/\/projects$/);
  const res = await page.goto(`/projects/${clinicId}`);
  expect(res?.status()).toBe(404);
  await expect(page.getByRole("heading", { name: "Not found" })).toBeVisible();
  await expect(page.getByText("Marlow Quay")).toHaveCount(0);
});

test("the health check tells anyone the service is up, and only a signed-in administrator which database it uses", async ({ request, playwright, baseURL }) => {
  expect(await (await request.get("/api/health")).json()).toEqual({ status: "ok" });
  for (const [email, body] of [
    ["engineer@example.test", { status: "ok" }],
    ["admin@example.test", { status: "ok", database: "pglite" }],
  ] as const) {
    const api = await playwright.request.newContext({ baseURL });
    await api.post("/api/auth/sign-in", { data: { email, password: DEMO_PASSWORD } });
    expect(await (await api.get("/api/health")).json()).toEqual(body);
    await api.dispose();
  }
});

test("each user picks the unit system every screen shows", async ({ page }) => {
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("owner@example.test");
  await page.getByRole("link", { name: new RegExp(LIBRARY) }).click();
  // The library project is set to SI: AHU-1's design airflow reads 4,000 L/s.
  await expect(page.getByText("4,000 L/s").first()).toBeVisible();
  await page.getByRole("group", { name: "Units" }).getByText("IP", { exact: true }).click();
  // 4.000 m³/s ÷ 4.719474×10⁻⁴ m³/s per cfm (NIST SP 811) = 8 475.5 → 8,476 cfm.
  await expect(page.getByText("8,476 cfm").first()).toBeVisible();
  await page.reload();
  await expect(page.getByRole("radio", { name: "IP" })).toBeChecked();
  await page.getByRole("group", { name: "Units" }).getByText("Project", { exact: true }).click();
  await expect(page.getByText("4,000 L/s").first()).toBeVisible();
});

test("a bad preference is refused with the field named", async ({ playwright, baseURL }) => {
  const api = await playwright.request.newContext({ baseURL });
  await api.post("/api/auth/sign-in", { data: { email: "owner@example.test", password: DEMO_PASSWORD } });
  const res = await api.patch("/api/v1/me", { data: { unit_system: "metric" } });
  expect(res.status()).toBe(400);
  expect((await res.json()).error.fields).toHaveProperty("unit_system");
  await api.dispose();
});

test("signing out ends the session and says so", async ({ page, context }) => {
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("cx@example.test");
  await expect(page).toHaveURL(/\/projects$/);
  await page.getByRole("banner").getByRole("button", { name: "Sign out" }).click();
  await expect(page.getByRole("heading", { name: "You are signed out" })).toBeVisible();
  expect((await context.cookies()).filter((c) => c.name === "airtally_session")).toHaveLength(0);
  await page.goto("/projects");
  await expect(page).toHaveURL(/\/sign-in$/);
});

test("the sign-out page asks before ending a session", async ({ page }) => {
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("owner@example.test");
  await expect(page).toHaveURL(/\/projects$/);
  await page.goto("/sign-out");
  await expect(page.getByText("You are signed in as Maren Holt")).toBeVisible();
  await page.getByRole("link", { name: "Stay signed in" }).click();
  await expect(page).toHaveURL(/\/projects$/);
});

test("a role that opens another role's screen is told why it cannot use it", async ({ page }) => {
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("tech@example.test");
  await page.getByRole("link", { name: new RegExp(LIBRARY) }).click();
  await expect(page.getByRole("heading", { level: 1, name: LIBRARY })).toBeVisible();
  await page.goto(`${page.url()}/review`);
  await expect(page.getByRole("alert").filter({ hasText: "does not include reviewing readings" })).toBeVisible();
});
