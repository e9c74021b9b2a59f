import "server-only";
import { count, eq, sql } from "drizzle-orm";
import { getDb } from "../client";
import { airSystems, ductSections, terminals } from "../schema";

export interface TerminalCounts {
  outlets: number;
  terminalUnits: number;
}

/** Per system: how many air outlets and inlets, and how many terminal units (VAV and constant-volume boxes). */
export async function countTerminalsBySystem({ projectId }: { projectId: string }): Promise<Map<string, TerminalCounts>> {
  const db = await getDb();
  const rows = await db
    .select({
      systemId: ductSections.systemId,
      units: sql<number>`count(*) filter (where ${terminals.type} in ('vav_box', 'constant_volume_box'))::int`,
      all: count(),
    })
    .from(terminals)
    .innerJoin(ductSections, eq(ductSections.id, terminals.sectionId))
    .innerJoin(airSystems, eq(airSystems.id, ductSections.systemId))
    .where(eq(airSystems.projectId, projectId))
    .groupBy(ductSections.systemId);
  return new Map(rows.map((r) => [r.systemId, { outlets: r.all - r.units, terminalUnits: r.units }]));
}
