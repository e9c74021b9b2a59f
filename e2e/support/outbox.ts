import { expect, type APIRequestContext } from "@playwright/test";
import { DEMO_PASSWORD } from "../pages/sign-in-page";

/** Signs a request context in as a demo account. */
export async function signInApi(request: APIRequestContext, email: string, password = DEMO_PASSWORD) {
  const res = await request.post("/api/auth/sign-in", { data: { email, password } });
  expect(res.status(), await res.text()).toBe(204);
}

/** The newest invitation link in the outbox for an address (read as the site administrator). */
export async function invitationPathFor(request: APIRequestContext, to: string): Promise<string> {
  const res = await request.get(`/api/v1/admin/outbox?to=${encodeURIComponent(to)}&limit=1`);
  expect(res.status()).toBe(200);
  const { messages } = (await res.json()) as { messages: { kind: string; text: string }[] };
  expect(messages[0]?.kind).toBe("invitation");
  const url = messages[0]!.text.match(/https?:\/\/\S+\/invite\/\S+/)![0];
  return new URL(url).pathname;
}
