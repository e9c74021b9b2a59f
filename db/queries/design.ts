import "server-only";
import { and, asc, count, eq, inArray, sql } from "drizzle-orm";
import { getDb } from "../client";
import {
  airSystems,
  ductSections,
  operatingConditions,
  projectMembers,
  projects,
  terminalReadings,
  terminals,
  terminalSets,
  traverses,
  type AirSystem,
  type DuctSection,
  type Project,
  type Terminal,
} from "../schema";
import { isUuid } from "./projects";

type Db = Awaited<ReturnType<typeof getDb>>;
/** A database or an open transaction: queries that run inside a caller's transaction take either. */
export type Executor = Db | Parameters<Parameters<Db["transaction"]>[0]>[0];

/** Whether the user is an engineer on at least one project (they may then start new projects). */
export async function isEngineerOnAnyProject({ userId }: { userId: string }): Promise<boolean> {
  const db = await getDb();
  const [row] = await db
    .select({ n: count() })
    .from(projectMembers)
    .where(and(eq(projectMembers.userId, userId), eq(projectMembers.role, "engineer")));
  return (row?.n ?? 0) > 0;
}

/** Creates a project and makes its creator the project's engineer, in one transaction. */
export async function insertProjectWithEngineer({ values, userId }: { values: typeof projects.$inferInsert; userId: string }): Promise<Project> {
  const db = await getDb();
  return db.transaction(async (tx) => {
    const [project] = await tx.insert(projects).values(values).returning();
    await tx.insert(projectMembers).values({ projectId: project!.id, userId, role: "engineer" });
    return project!;
  });
}

export async function updateProjectRow({ projectId, values }: { projectId: string; values: Partial<typeof projects.$inferInsert> }): Promise<Project> {
  const db = await getDb();
  const [row] = await db.update(projects).set(values).where(eq(projects.id, projectId)).returning();
  return row!;
}

/** An air system of this project, or null for an unknown id or another project's. */
export async function getSystemInProject({ projectId, systemId }: { projectId: string; systemId: string }, db?: Executor): Promise<AirSystem | null> {
  if (!isUuid(systemId)) return null;
  const ex = db ?? (await getDb());
  const [row] = await ex.select().from(airSystems).where(and(eq(airSystems.id, systemId), eq(airSystems.projectId, projectId)));
  return row ?? null;
}

export async function listSystemsOfProject({ projectId }: { projectId: string }, db?: Executor): Promise<AirSystem[]> {
  const ex = db ?? (await getDb());
  return ex.select().from(airSystems).where(eq(airSystems.projectId, projectId)).orderBy(asc(airSystems.tag));
}

/** A duct section of this project with its system, or null for an unknown id or another project's. */
export async function getSectionInProject({ projectId, sectionId }: { projectId: string; sectionId: string }, db?: Executor): Promise<{ section: DuctSection; system: AirSystem } | null> {
  if (!isUuid(sectionId)) return null;
  const ex = db ?? (await getDb());
  const [row] = await ex
    .select({ section: ductSections, system: airSystems })
    .from(ductSections)
    .innerJoin(airSystems, eq(airSystems.id, ductSections.systemId))
    .where(and(eq(ductSections.id, sectionId), eq(airSystems.projectId, projectId)));
  return row ?? null;
}

export async function listSectionsOfSystem({ systemId }: { systemId: string }, db?: Executor): Promise<DuctSection[]> {
  const ex = db ?? (await getDb());
  return ex.select().from(ductSections).where(eq(ductSections.systemId, systemId)).orderBy(asc(ductSections.tag));
}

/** A terminal of this project with its section and system, or null for an unknown id or another project's. */
export async function getTerminalInProject(
  { projectId, terminalId }: { projectId: string; terminalId: string },
  db?: Executor,
): Promise<{ terminal: Terminal; section: DuctSection; system: AirSystem } | null> {
  if (!isUuid(terminalId)) return null;
  const ex = db ?? (await getDb());
  const [row] = await ex
    .select({ terminal: terminals, section: ductSections, system: airSystems })
    .from(terminals)
    .innerJoin(ductSections, eq(ductSections.id, terminals.sectionId))
    .innerJoin(airSystems, eq(airSystems.id, ductSections.systemId))
    .where(and(eq(terminals.id, terminalId), eq(airSystems.projectId, projectId)));
  return row ?? null;
}

/** The project's terminals, optionally of one system or one section, in tag order. */
export async function listTerminalsOfProject({ projectId, systemId, sectionId }: { projectId: string; systemId?: string; sectionId?: string }): Promise<Terminal[]> {
  const db = await getDb();
  const rows = await db
    .select({ terminal: terminals })
    .from(terminals)
    .innerJoin(ductSections, eq(ductSections.id, terminals.sectionId))
    .innerJoin(airSystems, eq(airSystems.id, ductSections.systemId))
    .where(
      and(
        eq(airSystems.projectId, projectId),
        systemId ? eq(airSystems.id, systemId) : undefined,
        sectionId ? eq(ductSections.id, sectionId) : undefined,
      ),
    )
    .orderBy(asc(terminals.tag));
  return rows.map((r) => r.terminal);
}

/** Terminals of a system (any section), for tag checks. */
export async function listTerminalsOfSystem({ systemId }: { systemId: string }, db?: Executor): Promise<Terminal[]> {
  const ex = db ?? (await getDb());
  const rows = await ex
    .select({ terminal: terminals })
    .from(terminals)
    .innerJoin(ductSections, eq(ductSections.id, terminals.sectionId))
    .where(eq(ductSections.systemId, systemId))
    .orderBy(asc(terminals.tag));
  return rows.map((r) => r.terminal);
}

/** Field data that would go with these sections, terminals or system: what a delete must never take silently. */
export interface FieldDataHeld {
  traverses: number;
  /** Tags of the sections whose traverses these are. */
  traversedSections: string[];
  terminalReadings: number;
  /** Tags of the terminals whose readings these are. */
  readTerminals: string[];
  terminalSets: number;
  operatingConditions: number;
}

export function holdsFieldData(held: FieldDataHeld): boolean {
  return held.traverses + held.terminalReadings + held.terminalSets + held.operatingConditions > 0;
}

export async function countFieldData({ sectionIds, terminalIds, systemId }: { sectionIds: string[]; terminalIds: string[]; systemId?: string }, db?: Executor): Promise<FieldDataHeld> {
  const ex = db ?? (await getDb());
  const traversed =
    sectionIds.length === 0
      ? []
      : await ex
          .select({ tag: ductSections.tag, n: count() })
          .from(traverses)
          .innerJoin(ductSections, eq(ductSections.id, traverses.sectionId))
          .where(inArray(traverses.sectionId, sectionIds))
          .groupBy(ductSections.tag)
          .orderBy(asc(ductSections.tag));
  const read =
    terminalIds.length === 0
      ? []
      : await ex
          .select({ tag: terminals.tag, n: count() })
          .from(terminalReadings)
          .innerJoin(terminals, eq(terminals.id, terminalReadings.terminalId))
          .where(inArray(terminalReadings.terminalId, terminalIds))
          .groupBy(terminals.tag)
          .orderBy(asc(terminals.tag));
  let sets = 0;
  let conditions = 0;
  if (systemId) {
    sets = (await ex.select({ n: count() }).from(terminalSets).where(eq(terminalSets.systemId, systemId)))[0]?.n ?? 0;
    conditions = (await ex.select({ n: count() }).from(operatingConditions).where(eq(operatingConditions.systemId, systemId)))[0]?.n ?? 0;
  }
  return {
    traverses: traversed.reduce((a, r) => a + r.n, 0),
    traversedSections: traversed.map((r) => r.tag),
    terminalReadings: read.reduce((a, r) => a + r.n, 0),
    readTerminals: read.map((r) => r.tag),
    terminalSets: sets,
    operatingConditions: conditions,
  };
}

/** Traverse count per section and reading count per terminal of a project, for the set-up screens. */
export async function countFieldDataByItem({ projectId }: { projectId: string }) {
  const db = await getDb();
  const bySection = await db
    .select({ sectionId: traverses.sectionId, n: count() })
    .from(traverses)
    .innerJoin(ductSections, eq(ductSections.id, traverses.sectionId))
    .innerJoin(airSystems, eq(airSystems.id, ductSections.systemId))
    .where(eq(airSystems.projectId, projectId))
    .groupBy(traverses.sectionId);
  const byTerminal = await db
    .select({ terminalId: terminalReadings.terminalId, n: count() })
    .from(terminalReadings)
    .innerJoin(terminals, eq(terminals.id, terminalReadings.terminalId))
    .innerJoin(ductSections, eq(ductSections.id, terminals.sectionId))
    .innerJoin(airSystems, eq(airSystems.id, ductSections.systemId))
    .where(eq(airSystems.projectId, projectId))
    .groupBy(terminalReadings.terminalId);
  return {
    traversesBySection: new Map(bySection.map((r) => [r.sectionId, r.n])),
    readingsByTerminal: new Map(byTerminal.map((r) => [r.terminalId, r.n])),
  };
}

export async function insertSystem(values: typeof airSystems.$inferInsert): Promise<AirSystem> {
  const db = await getDb();
  const [row] = await db.insert(airSystems).values(values).returning();
  return row!;
}

export async function updateSystemRow({ systemId, values }: { systemId: string; values: Partial<typeof airSystems.$inferInsert> }): Promise<AirSystem> {
  const db = await getDb();
  const [row] = await db.update(airSystems).set(values).where(eq(airSystems.id, systemId)).returning();
  return row!;
}

export async function insertSection(values: typeof ductSections.$inferInsert): Promise<DuctSection> {
  const db = await getDb();
  const [row] = await db.insert(ductSections).values(values).returning();
  return row!;
}

export async function updateSectionRow({ sectionId, values }: { sectionId: string; values: Partial<typeof ductSections.$inferInsert> }, db?: Executor): Promise<DuctSection> {
  const ex = db ?? (await getDb());
  const [row] = await ex.update(ductSections).set(values).where(eq(ductSections.id, sectionId)).returning();
  return row!;
}

export async function insertTerminal(values: typeof terminals.$inferInsert): Promise<Terminal> {
  const db = await getDb();
  const [row] = await db.insert(terminals).values(values).returning();
  return row!;
}

export async function updateTerminalRow({ terminalId, values }: { terminalId: string; values: Partial<typeof terminals.$inferInsert> }): Promise<Terminal> {
  const db = await getDb();
  const [row] = await db.update(terminals).set(values).where(eq(terminals.id, terminalId)).returning();
  return row!;
}

/**
 * Deletes the rows when no field data hangs on them, checked and done in one transaction so a reading
 * recorded in between cannot be swept away. Returns what held the rows otherwise.
 */
export async function deleteDesignRows(
  target: { systemId: string } | { sectionIds: string[] } | { terminalId: string },
  scope: { sectionIds: string[]; terminalIds: string[]; systemId?: string },
): Promise<{ deleted: true } | { deleted: false; held: FieldDataHeld }> {
  const db = await getDb();
  return db.transaction(async (tx) => {
    const held = await countFieldData(scope, tx);
    if (holdsFieldData(held)) return { deleted: false as const, held };
    if ("systemId" in target) await tx.delete(airSystems).where(eq(airSystems.id, target.systemId));
    else if ("sectionIds" in target) await tx.delete(ductSections).where(inArray(ductSections.id, target.sectionIds));
    else await tx.delete(terminals).where(eq(terminals.id, target.terminalId));
    return { deleted: true as const };
  });
}

/** Every section and terminal id below (and including) these sections of a system. */
export function subtreeOf(sections: Pick<DuctSection, "id" | "parentId">[], rootId: string): string[] {
  const children = new Map<string | null, string[]>();
  for (const s of sections) children.set(s.parentId, [...(children.get(s.parentId) ?? []), s.id]);
  const out: string[] = [];
  const stack = [rootId];
  while (stack.length) {
    const id = stack.pop()!;
    out.push(id);
    stack.push(...(children.get(id) ?? []));
  }
  return out;
}

export async function listTerminalIdsOfSections({ sectionIds }: { sectionIds: string[] }, db?: Executor): Promise<Terminal[]> {
  if (sectionIds.length === 0) return [];
  const ex = db ?? (await getDb());
  return ex.select().from(terminals).where(inArray(terminals.sectionId, sectionIds)).orderBy(asc(terminals.tag));
}

/** Used by the unique-tag checks: is this tag taken by another section of the system (any case)? */
export async function findSectionByTag({ systemId, tag }: { systemId: string; tag: string }, db?: Executor): Promise<DuctSection | null> {
  const ex = db ?? (await getDb());
  const [row] = await ex
    .select()
    .from(ductSections)
    .where(and(eq(ductSections.systemId, systemId), eq(sql`lower(${ductSections.tag})`, tag.toLowerCase())));
  return row ?? null;
}

export async function findSystemByTag({ projectId, tag }: { projectId: string; tag: string }): Promise<AirSystem | null> {
  const db = await getDb();
  const [row] = await db
    .select()
    .from(airSystems)
    .where(and(eq(airSystems.projectId, projectId), eq(sql`lower(${airSystems.tag})`, tag.toLowerCase())));
  return row ?? null;
}
