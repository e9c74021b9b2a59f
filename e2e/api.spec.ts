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

test("repeated wrong passwords for one e-mail are slowed down", async ({ request }) => {
  const attempt = () => request.post("/api/auth/sign-in", { data: { email: "nobody@example.test", password: "guess" } });
  for (let i = 0; i < 10; i++) expect((await attempt()).status()).toBe(401);
  const blocked = await attempt();
  expect(blocked.status()).toBe(429);
  expect((await blocked.json()).error.message).toContain("Too many wrong passwords");
});

test("many requests at once on the single-connection embedded database all succeed", async ({ playwright, baseURL }) => {
  const api = await signedIn(playwright, baseURL, "engineer@example.test");
  const calls = Array.from({ length: 40 }, (_, i) => (i % 2 === 0 ? api.get("/api/v1/projects") : api.get("/api/auth/me")));
  const statuses = (await Promise.all(calls)).map((r) => r.status());
  expect(statuses).toEqual(Array(40).fill(200));
  await api.dispose();
});

test("a project's design is readable by its members only", async ({ playwright, baseURL }) => {
  const engineer = await signedIn(playwright, baseURL, "engineer@example.test");
  const { projects } = (await (await engineer.get("/api/v1/projects")).json()) as { projects: { id: string; name: string }[] };
  const clinic = projects.find((p) => p.name.startsWith("Marlow Quay"))!;
  const library = projects.find((p) => p.name.startsWith("Wrenfield"))!;
  const res = await engineer.get(`/api/v1/projects/${library.id}`);
  expect(res.status()).toBe(200);
  const body = await res.json();
  expect(body.role).toBe("engineer");
  expect(body.systems.map((s: { tag: string }) => s.tag)).toEqual(["AHU-1", "EF-1"]);
  expect(body.sections).toHaveLength(7);
  await engineer.dispose();

  const tech = await signedIn(playwright, baseURL, "tech@example.test");
  const hidden = await tech.get(`/api/v1/projects/${clinic.id}`);
  expect(hidden.status()).toBe(404);
  expect((await hidden.json()).error.message).toContain("not a member");
  expect((await tech.get("/api/v1/projects/not-a-uuid")).status()).toBe(404);
  await tech.dispose();
});
