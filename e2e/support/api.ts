import { expect, type APIRequestContext } from "@playwright/test";
import { DEMO_PASSWORD } from "../pages/sign-in-page";

/** An API context signed in as a demo account (Playwright's `playwright` fixture gives the factory). */
export async function apiAs(playwright: { request: { newContext(o: { baseURL?: string }): Promise<APIRequestContext> } }, baseURL: string | undefined, email: string) {
  const api = await playwright.request.newContext({ baseURL });
  expect((await api.post("/api/auth/sign-in", { data: { email, password: DEMO_PASSWORD } })).status()).toBe(204);
  return api;
}
