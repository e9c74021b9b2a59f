import { expect, test, type APIRequestContext } from "@playwright/test";
import { DEMO_PASSWORD } from "./pages/sign-in-page";

// Runs after every other spec (playwright.config.ts): it ends sessions and changes a password.
const EMAIL = "cx@example.test";

async function device(playwright: { request: { newContext(o: { baseURL?: string }): Promise<APIRequestContext> } }, baseURL: string | undefined, password = DEMO_PASSWORD) {
  const api = await playwright.request.newContext({ baseURL });
  expect((await api.post("/api/auth/sign-in", { data: { email: EMAIL, password } })).status()).toBe(204);
  expect((await api.get("/api/auth/me")).status()).toBe(200);
  return api;
}

test("signing out everywhere ends the session on every device", async ({ playwright, baseURL }) => {
  const tablet = await device(playwright, baseURL);
  const laptop = await device(playwright, baseURL);
  expect((await laptop.post("/api/auth/sign-out-everywhere")).status()).toBe(204);
  expect((await tablet.get("/api/auth/me")).status()).toBe(401);
  expect((await laptop.get("/api/auth/me")).status()).toBe(401);
  // A fresh sign-in works at once.
  const again = await device(playwright, baseURL);
  await Promise.all([tablet.dispose(), laptop.dispose(), again.dispose()]);
});

test("a new password ends every other session and keeps this one", async ({ playwright, baseURL }) => {
  const other = await device(playwright, baseURL);
  const here = await device(playwright, baseURL);
  const wrong = await here.post("/api/auth/password", { data: { current_password: "nope", new_password: "a-new-long-password" } });
  expect(wrong.status()).toBe(400);
  expect((await wrong.json()).error.fields).toHaveProperty("current_password");
  const short = await here.post("/api/auth/password", { data: { current_password: DEMO_PASSWORD, new_password: "short" } });
  expect((await short.json()).error.fields).toHaveProperty("new_password");

  expect((await here.post("/api/auth/password", { data: { current_password: DEMO_PASSWORD, new_password: "a-new-long-password" } })).status()).toBe(204);
  expect((await other.get("/api/auth/me")).status()).toBe(401);
  expect((await here.get("/api/auth/me")).status()).toBe(200);
  expect((await (await playwright.request.newContext({ baseURL })).post("/api/auth/sign-in", { data: { email: EMAIL, password: DEMO_PASSWORD } })).status()).toBe(401);

  // Put the demo password back for anyone who runs the suite's server further.
  expect((await here.post("/api/auth/password", { data: { current_password: "a-new-long-password", new_password: DEMO_PASSWORD } })).status()).toBe(204);
  await Promise.all([other.dispose(), here.dispose()]);
});

test("the sign-out page ends every session of the user from one click", async ({ page, playwright, baseURL }) => {
  const tablet = await device(playwright, baseURL);
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(EMAIL);
  await page.getByLabel("Password").fill(DEMO_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page).toHaveURL(/\/projects$/);
  await page.goto("/sign-out");
  await page.getByRole("button", { name: "Sign out on every device" }).click();
  await expect(page.getByRole("heading", { name: "You are signed out" })).toBeVisible();
  expect((await tablet.get("/api/auth/me")).status()).toBe(401);
  await tablet.dispose();
});
