import { expect, test, type APIRequestContext } from "@playwright/test";
import { DEMO_PASSWORD } from "./pages/sign-in-page";

async function signedIn(playwright: { request: { newContext(o: { baseURL?: string }): Promise<APIRequestContext> } }, baseURL: string | undefined, email: string) {
  const api = await playwright.request.newContext({ baseURL });
  expect((await api.post("/api/auth/sign-in", { data: { email, password: DEMO_PASSWORD } })).status()).toBe(204);
  return api;
}

// A 600 mm round duct, two diameters of six log-linear points (ISO 3966 positions).
const TRAVERSE = {
  duct: { shape: "round", diameter_mm: 600 },
  method: "log-linear",
  air: { dry_bulb_c: 20, barometric_pa: 101_325, static_pa: 0, relative_humidity_pct: 0 },
  readings: [
    [60, 60, 60, 60, 60, 60],
    [60, 60, 60, 60, 60, 60],
  ],
};

test("the engine answers signed-in users over HTTP with the CLI's contract", async ({ playwright, baseURL }) => {
  const api = await signedIn(playwright, baseURL, "engineer@example.test");
  const res = await api.post("/api/v1/calc/traverse", { data: TRAVERSE });
  expect(res.status()).toBe(200);
  const out = await res.json();
  // Dry air at 20 °C, 101 325 Pa: ρ = p/(R·T) = 101 325/(287.042·293.15) = 1.2042 kg/m³ (ASHRAE Fundamentals ch. 1 eq. 28).
  expect(out.density_kg_m3).toBeCloseTo(1.2042, 3);
  // Uniform 60 Pa: V = √(2·60/1.2042) = 9.983 m/s (incompressible; the isentropic correction is −0.01 %), A = π·0.3² m².
  expect(out.mean_velocity_m_s).toBeCloseTo(9.982, 2);
  expect(out.flow_m3_s).toBeCloseTo(out.mean_velocity_m_s * Math.PI * 0.09, 6);
  expect(out.points).toHaveLength(12);
  await api.dispose();
});

test("bad engine input gets 400 with the field at fault, signed-out callers 401", async ({ playwright, baseURL, request }) => {
  const api = await signedIn(playwright, baseURL, "tech@example.test");
  const res = await api.post("/api/v1/calc/traverse", { data: { ...TRAVERSE, air: { ...TRAVERSE.air, relative_humidity_pct: 140 } } });
  expect(res.status()).toBe(400);
  const body = await res.json();
  expect(Object.keys(body.error.fields)).toContain("air.relative_humidity_pct");
  expect(body.error.fields["air.relative_humidity_pct"]).toContain("140");

  const unknown = await api.post("/api/v1/calc/teleport", { data: {} });
  expect(unknown.status()).toBe(400);
  expect((await unknown.json()).error.fields).toHaveProperty("command");
  await api.dispose();

  expect((await request.post("/api/v1/calc/layout", { data: { duct: { shape: "round", diameter_mm: 600 }, method: "equal-area" } })).status()).toBe(401);
});

test("the traverse answer states its expanded uncertainty per flow with k = 2, beside the first contract's keys", async ({ playwright, baseURL }) => {
  const api = await signedIn(playwright, baseURL, "tech@example.test");
  const res = await api.post("/api/v1/calc/traverse", { data: { ...TRAVERSE, air: { ...TRAVERSE.air, altitude_m: 1500 } } });
  expect(res.status()).toBe(200);
  const out = await res.json();
  expect(out.uncertainty).toEqual(expect.objectContaining({ expanded_pct: expect.any(Number), coverage_factor: 2 }));
  expect(out.uncertainty_pct).toBe(out.uncertainty.expanded_pct);
  expect(out.uncertainty_terms_pct).toEqual(expect.objectContaining({ dimension: expect.any(Number), sampling: expect.any(Number) }));
  for (const flow of ["actual", "standard", "mass"]) expect(out.uncertainty[flow].expanded_pct).toEqual(expect.any(Number));
  // 101 325 Pa read at a 1500 m site (standard atmosphere 84 556 Pa, ASHRAE Fundamentals ch. 1 eq. 3): accepted, and warned about.
  expect(out.warnings.join(" ")).toContain("sea-level-corrected");
  await api.dispose();
});

test("readings that cannot be a traverse, oversized inputs and wrong types get a 400 in our own words", async ({ playwright, baseURL }) => {
  const api = await signedIn(playwright, baseURL, "tech@example.test");
  const swapped = await api.post("/api/v1/calc/traverse", { data: { ...TRAVERSE, readings: TRAVERSE.readings.map((row) => row.map((v) => -v)) } });
  expect(swapped.status()).toBe(400);
  expect((await swapped.json()).error.fields.readings).toContain("reversed");

  // Counts are checked before values: 101 lines, and 5 001 empty sections, are refused without reading them.
  const lines = await api.post("/api/v1/calc/traverse", { data: { ...TRAVERSE, readings: Array.from({ length: 101 }, () => [1]) } });
  expect(lines.status()).toBe(400);
  expect((await lines.json()).error.fields.readings).toContain("at most 100 lines");
  const nodes = await api.post("/api/v1/calc/network", { data: { nodes: Array.from({ length: 5_001 }, () => ({})) } });
  expect(nodes.status()).toBe(400);
  expect((await nodes.json()).error.fields.nodes).toContain("at most 5,000");

  const wrong = await api.post("/api/v1/calc/traverse", { data: { ...TRAVERSE, air: [1, 2], probe: "pitot" } });
  expect(wrong.status()).toBe(400);
  const fields = (await wrong.json()).error.fields as Record<string, string>;
  expect(fields.air).toContain("got a list");
  expect(fields.probe).toContain('got the text "pitot"');
  for (const message of Object.values(fields)) expect(message).not.toMatch(/^Invalid input|expected \w+, received/);
  await api.dispose();
});

test("responses forbid framing and content sniffing", async ({ request }) => {
  const res = await request.get("/sign-in");
  expect(res.headers()["x-frame-options"]).toBe("DENY");
  expect(res.headers()["x-content-type-options"]).toBe("nosniff");
});

test("unknown API paths answer 404 in the API's error shape", async ({ request }) => {
  const res = await request.get("/api/v1/no-such-thing");
  expect(res.status()).toBe(404);
  expect((await res.json()).error.message).toContain("/api/v1/no-such-thing");
});

test("wrong passwords make the next attempt wait a little longer each time, for known and unknown e-mails alike, and the real user gets in after the wait", async ({ playwright, baseURL }) => {
  // A client address of its own (the last X-Forwarded-For hop), so other tests' sign-ins are not slowed.
  const api = await playwright.request.newContext({ baseURL, extraHTTPHeaders: { "x-forwarded-for": "198.51.100.21" } });
  const attempt = (email: string, password = "guess") => api.post("/api/auth/sign-in", { data: { email, password } });
  const answers: { status: number; message: string; retry?: string }[] = [];
  for (const email of ["owner@example.test", "nobody-here@example.test"]) {
    for (let i = 0; i < 5; i++) expect((await attempt(email)).status()).toBe(401);
    // The next one waits (on a slow machine a second may already have passed, letting one more through).
    let slowed = await attempt(email);
    for (let extra = 0; slowed.status() === 401 && extra < 2; extra++) slowed = await attempt(email);
    const message: string = (await slowed.json()).error.message;
    answers.push({ status: slowed.status(), message: message.replace(/\d+ seconds?/, "N seconds"), retry: slowed.headers()["retry-after"] });
  }
  // The same answer whether or not the account exists.
  expect(answers[0]!.status).toBe(429);
  expect(answers[1]!.status).toBe(429);
  expect(answers[0]!.message).toBe(answers[1]!.message);
  expect(answers[0]!.message).toBe("Too many sign-in attempts for this e-mail. Wait N seconds and try again.");
  const wait = Number(answers[0]!.retry);
  expect(wait).toBeGreaterThanOrEqual(1);
  expect(wait).toBeLessThanOrEqual(8);
  await new Promise((r) => setTimeout(r, wait * 1000 + 200));
  expect((await attempt("owner@example.test", DEMO_PASSWORD)).status()).toBe(204);
  await api.dispose();
});

test("a burst of parallel guesses is counted in full: only the free attempts reach the password check", async ({ playwright, baseURL }) => {
  const api = await playwright.request.newContext({ baseURL, extraHTTPHeaders: { "x-forwarded-for": "198.51.100.22" } });
  const started = Date.now();
  const statuses = await Promise.all(Array.from({ length: 12 }, () => api.post("/api/auth/sign-in", { data: { email: "engineer@example.test", password: "guess" } }).then((r) => r.status())));
  // Five free attempts; beyond them the backoff (1 s, 2 s, 4 s…) lets one more through per step of
  // the time the burst took, which is none when it takes under a second.
  const extra = Math.floor(Math.log2((Date.now() - started) / 1000 + 1));
  const rejected = statuses.filter((s) => s === 429).length;
  expect(statuses.filter((s) => s === 401).length).toBe(12 - rejected);
  expect(rejected).toBeGreaterThanOrEqual(7 - extra);
  await api.dispose();
});

test("bodies are bounded and must be JSON: 413 over the cap (declared or streamed), 415 for another type", async ({ playwright, baseURL }) => {
  const api = await signedIn(playwright, baseURL, "owner@example.test");
  const big = JSON.stringify({ unit_system: "SI", pad: "x".repeat(1024 * 1024) });
  const tooBig = await api.patch("/api/v1/me", { data: big, headers: { "content-type": "application/json" } });
  expect(tooBig.status()).toBe(413);
  expect((await tooBig.json()).error.message).toContain("1 MiB");
  const signInBig = await api.post("/api/auth/sign-in", { data: { email: "owner@example.test", password: "x".repeat(20_000) } });
  expect(signInBig.status()).toBe(413);
  expect((await signInBig.json()).error.message).toContain("16 KiB");
  const form = await api.patch("/api/v1/me", { form: { unit_system: "SI" } });
  expect(form.status()).toBe(415);
  expect((await form.json()).error.message).toContain("Content-Type: application/json");

  // A chunked body with no Content-Length is cut off while streaming.
  const cookie = (await api.storageState()).cookies.map((c) => `${c.name}=${c.value}`).join("; ");
  const chunk = new TextEncoder().encode("x".repeat(64 * 1024));
  let sent = 0;
  const stream = new ReadableStream<Uint8Array>({
    pull(controller) {
      if (sent++ < 40) controller.enqueue(chunk);
      else controller.close();
    },
  });
  const streamed = await fetch(`${baseURL}/api/v1/me`, { method: "PATCH", headers: { "content-type": "application/json", cookie }, body: stream, duplex: "half" } as RequestInit);
  expect(streamed.status).toBe(413);
  await api.dispose();
});

test("state-changing requests from another site are refused", async ({ playwright, baseURL }) => {
  const api = await signedIn(playwright, baseURL, "owner@example.test");
  const res = await api.patch("/api/v1/me", { data: { unit_system: null }, headers: { origin: "https://elsewhere.example" } });
  expect(res.status()).toBe(403);
  expect((await res.json()).error.message).toContain("another site");
  expect((await api.patch("/api/v1/me", { data: { unit_system: null }, headers: { origin: baseURL! } })).status()).toBe(200);
  expect((await api.post("/api/auth/sign-in", { data: { email: "owner@example.test", password: DEMO_PASSWORD }, headers: { origin: "https://elsewhere.example" } })).status()).toBe(403);
  await api.dispose();
});

test("API answers are never cached", async ({ request }) => {
  expect((await request.get("/api/health")).headers()["cache-control"]).toBe("no-store");
  expect((await request.get("/api/v1/projects")).headers()["cache-control"]).toBe("no-store");
});

test("many requests at once on the single-connection embedded database all succeed", async ({ playwright, baseURL }) => {
  const api = await signedIn(playwright, baseURL, "engineer@example.test");
  const calls = Array.from({ length: 40 }, (_, i) => (i % 2 === 0 ? api.get("/api/v1/projects") : api.get("/api/auth/me")));
  const statuses = (await Promise.all(calls)).map((r) => r.status());
  expect(statuses).toEqual(Array(40).fill(200));
  await api.dispose();
});

test("a project's design is readable by its members only, owners included", async ({ playwright, baseURL }) => {
  const engineer = await signedIn(playwright, baseURL, "engineer@example.test");
  const { projects } = (await (await engineer.get("/api/v1/projects")).json()) as { projects: { id: string; name: string }[] };
  const clinic = projects.find((p) => p.name.startsWith("Marlow Quay"))!;
  const library = projects.find((p) => p.name.startsWith("Wrenfield"))!;
  const res = await engineer.get(`/api/v1/projects/${library.id}`);
  expect(res.status()).toBe(200);
  const body = await res.json();
  expect(body.role).toBe("engineer");
  expect(res.headers()["cache-control"]).toBe("no-store");
  expect(body.systems.map((s: { tag: string }) => s.tag)).toEqual(["AHU-1", "EF-1"]);
  expect(body.sections).toHaveLength(7);
  await engineer.dispose();

  // Owners read design against measured too: their closeout report shows it.
  const owner = await signedIn(playwright, baseURL, "owner@example.test");
  expect((await owner.get(`/api/v1/projects/${library.id}`)).status()).toBe(200);
  await owner.dispose();

  const tech = await signedIn(playwright, baseURL, "tech@example.test");
  const hidden = await tech.get(`/api/v1/projects/${clinic.id}`);
  expect(hidden.status()).toBe(404);
  expect((await hidden.json()).error.message).toContain("not a member");
  expect((await tech.get("/api/v1/projects/not-a-uuid")).status()).toBe(404);
  await tech.dispose();
});
