import "server-only";
import { eq, inArray } from "drizzle-orm";
import type { ExistingDesign, SchedulePlan } from "@/lib/design/schedule-csv";
import { terminalResource } from "@/lib/design/resources";
import { getDb } from "../client";
import { airSystems, ductSections, terminals } from "../schema";
import type { Executor } from "./design";

/** The project's design in the shape the schedule check takes. */
export async function loadExistingDesign({ projectId }: { projectId: string }, db?: Executor): Promise<ExistingDesign> {
  const ex = db ?? (await getDb());
  const systems = await ex.select({ id: airSystems.id, tag: airSystems.tag, kind: airSystems.kind }).from(airSystems).where(eq(airSystems.projectId, projectId));
  const systemIds = systems.map((s) => s.id);
  const sections = systemIds.length === 0 ? [] : await ex.select().from(ductSections).where(inArray(ductSections.systemId, systemIds));
  const sectionIds = sections.map((s) => s.id);
  const terminalRows = sectionIds.length === 0 ? [] : await ex.select().from(terminals).where(inArray(terminals.sectionId, sectionIds));
  return { systems, sections, terminals: terminalRows.map(terminalResource) };
}

export interface AppliedSchedule {
  added: { sections: string[]; terminals: string[] };
  updated: { sections: string[]; terminals: string[] };
}

/**
 * Checks the schedule against the design as it is inside one transaction and applies it only when
 * every row is clean: all of it or nothing. Returns the plan's preview when it is not clean.
 */
export async function applySchedule(
  { projectId, check }: { projectId: string; check: (existing: ExistingDesign) => SchedulePlan },
): Promise<{ ok: true; applied: AppliedSchedule; plan: SchedulePlan } | { ok: false; plan: SchedulePlan }> {
  const db = await getDb();
  const rollback = new Error("schedule not clean");
  let failed: SchedulePlan | null = null;
  try {
    return await db.transaction(async (tx) => {
      const existing = await loadExistingDesign({ projectId }, tx);
      const plan = check(existing);
      if (!plan.preview.ok) {
        failed = plan;
        throw rollback;
      }
      const applied: AppliedSchedule = { added: { sections: [], terminals: [] }, updated: { sections: [], terminals: [] } };
      const ids = new Map(existing.sections.map((s) => [`${s.systemId}:${s.tag.toLowerCase()}`, s.id]));
      const idOf = (systemId: string, tag: string) => ids.get(`${systemId}:${tag.toLowerCase()}`);
      for (const s of plan.sections) {
        if (s.action === "unchanged") continue;
        const parentId = s.parentTag ? idOf(s.systemId, s.parentTag) ?? null : null;
        const values = { ...s.values, tag: s.tag, parentId, kind: parentId ? ("branch" as const) : ("trunk" as const) };
        if (s.existingId) {
          await tx.update(ductSections).set(values).where(eq(ductSections.id, s.existingId));
          applied.updated.sections.push(s.tag);
        } else {
          const [row] = await tx.insert(ductSections).values({ ...values, systemId: s.systemId }).returning({ id: ductSections.id });
          ids.set(`${s.systemId}:${s.tag.toLowerCase()}`, row!.id);
          applied.added.sections.push(s.tag);
        }
      }
      for (const t of plan.terminals) {
        if (t.action === "unchanged") continue;
        const { kind, ...rest } = t.values;
        const values = { ...rest, type: kind, sectionId: idOf(t.systemId, t.parentTag)! };
        if (t.existingId) {
          await tx.update(terminals).set(values).where(eq(terminals.id, t.existingId));
          applied.updated.terminals.push(t.tag);
        } else {
          await tx.insert(terminals).values(values);
          applied.added.terminals.push(t.tag);
        }
      }
      return { ok: true as const, applied, plan };
    });
  } catch (err) {
    if (err === rollback && failed) return { ok: false, plan: failed };
    throw err;
  }
}
