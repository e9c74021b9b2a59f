/**
 * The write side of `npm run load`, chosen with `--write <name>`. Each mix turns the signed-in
 * sessions and the demo project into the requests one write connection cycles through. The default
 * is what technicians do all day: saving a traverse's readings grid.
 */
import type { Request as CannonRequest } from "autocannon";

export interface LoadContext {
  /** Session cookie header per demo account e-mail. */
  cookies: Record<string, string>;
  /** Ids of the demo projects by name. */
  projects: Record<string, string>;
  /** The server under load, e.g. http://127.0.0.1:41234 (for set-up requests). */
  base: string;
  /** How many write connections will run. */
  writers: number;
}

export type WriteMix = (ctx: LoadContext) => CannonRequest[] | Promise<CannonRequest[]>;

const json = (cookie: string) => ({ cookie, "content-type": "application/json" });

export const WRITE_MIXES: Record<string, WriteMix> = {
  /** PATCH /api/v1/me: each demo account saves its unit preference (one row update and one audit entry per request). */
  preference: ({ cookies }) =>
    Object.values(cookies).flatMap((cookie) =>
      (["IP", "SI", null] as const).map((unit_system) => ({ method: "PATCH" as const, path: "/api/v1/me", headers: json(cookie), body: JSON.stringify({ unit_system }) })),
    ),
};

/**
 * PUT …/traverses/{id}/readings: each write connection keeps its own draft traverse (started here on
 * the demo's exhaust trunk, one revision per connection) and saves its whole 2 × 8 grid at the
 * version the previous save returned, as a tablet's sync queue does: a version check, an upsert of the
 * changed points, an audit entry and the engine's reduction per request.
 */
async function readingsMix({ cookies, projects, base, writers }: LoadContext): Promise<CannonRequest[]> {
  const cookie = cookies["tech@example.test"];
  const projectId = Object.entries(projects).find(([name]) => name.startsWith("Wrenfield"))?.[1];
  if (!cookie || !projectId) throw new Error("the readings mix needs the technician's session and the library project");
  const design = (await (await fetch(`${base}/api/v1/projects/${projectId}`, { headers: { cookie } })).json()) as { sections: { id: string; tag: string }[] };
  const section = design.sections.find((s) => s.tag === "X1");
  if (!section) throw new Error("the demo's exhaust trunk X1 is missing");
  const traverses: string[] = [];
  for (let i = 0; i < Math.max(1, writers); i++) {
    const res = await fetch(`${base}/api/v1/projects/${projectId}/traverses`, {
      method: "POST",
      headers: json(cookie),
      body: JSON.stringify({ sectionId: section.id, method: "log-linear", air: { dryBulbC: 18, relativeHumidityPct: 45, staticPa: -150 } }),
    });
    if (res.status !== 201) throw new Error(`starting a load traverse answered ${res.status}`);
    traverses.push(((await res.json()) as { traverse: { id: string } }).traverse.id);
  }
  // autocannon clears a connection's context each time it loops over the request list, so the
  // versions live here: each save takes a traverse no other connection is saving, at its last version.
  const version = new Map(traverses.map((id) => [id, 1]));
  const saves = new Map(traverses.map((id) => [id, 0]));
  const busy = new Set<string>();
  type Conn = { traverseId?: string };
  return [
    {
      method: "PUT",
      path: "/",
      headers: json(cookie),
      setupRequest: (req, context) => {
        const id = traverses.find((t) => !busy.has(t)) ?? traverses[0]!;
        busy.add(id);
        (context as Conn).traverseId = id;
        const n = (saves.get(id) ?? 0) + 1;
        saves.set(id, n);
        // A point changes per save, as when a technician types along the line.
        const readings = [0, 1].map((k) => Array.from({ length: 8 }, (_, i) => 20 + 8 * Math.sin(((i + 0.5) / 8) * Math.PI) + ((n + i + k) % 5) * 0.1));
        return { ...req, path: `/api/v1/projects/${projectId}/traverses/${id}/readings`, body: JSON.stringify({ version: version.get(id), readings }) };
      },
      onResponse: (_status, body, context) => {
        const id = (context as Conn).traverseId;
        if (!id) return;
        busy.delete(id);
        try {
          // 200 and 409 both carry the traverse at its current version.
          const v = (JSON.parse(body) as { traverse?: { version?: number } }).traverse?.version;
          if (typeof v === "number") version.set(id, v);
        } catch {
          // A failed answer is counted by autocannon; the next save uses the version last known.
        }
      },
    },
  ];
}

WRITE_MIXES.readings = readingsMix;

export const DEFAULT_WRITE_MIX = "readings";
