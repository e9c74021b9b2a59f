import "server-only";
import { and, asc, desc, eq } from "drizzle-orm";
import { getDb } from "../client";
import { airSystems, users, verificationSampleItems, verificationSamples, type VerificationSample, type VerificationSampleItem } from "../schema";

export interface SampleWithItems {
  sample: VerificationSample;
  systemTag: string;
  drawnByName: string | null;
  items: (VerificationSampleItem & { readByName: string | null })[];
}

/** One sample of this project with its items in draw order; another project's answers like an unknown one. */
export async function getSampleInProject({ projectId, sampleId }: { projectId: string; sampleId: string }): Promise<SampleWithItems | null> {
  const db = await getDb();
  const [row] = await db
    .select({ sample: verificationSamples, systemTag: airSystems.tag, drawnByName: users.name })
    .from(verificationSamples)
    .innerJoin(airSystems, eq(airSystems.id, verificationSamples.systemId))
    .leftJoin(users, eq(users.id, verificationSamples.drawnBy))
    .where(and(eq(verificationSamples.id, sampleId), eq(verificationSamples.projectId, projectId)));
  if (!row) return null;
  const items = await db
    .select({ item: verificationSampleItems, readByName: users.name })
    .from(verificationSampleItems)
    .leftJoin(users, eq(users.id, verificationSampleItems.readBy))
    .where(eq(verificationSampleItems.sampleId, sampleId))
    .orderBy(asc(verificationSampleItems.position));
  return { ...row, items: items.map((i) => ({ ...i.item, readByName: i.readByName })) };
}

/** The samples of a project (or one system), newest first, without their items. */
export async function listSamples({ projectId, systemId, limit = 100 }: { projectId: string; systemId?: string; limit?: number }) {
  const db = await getDb();
  return db
    .select({ sample: verificationSamples, systemTag: airSystems.tag, drawnByName: users.name })
    .from(verificationSamples)
    .innerJoin(airSystems, eq(airSystems.id, verificationSamples.systemId))
    .leftJoin(users, eq(users.id, verificationSamples.drawnBy))
    .where(and(eq(verificationSamples.projectId, projectId), systemId ? eq(verificationSamples.systemId, systemId) : undefined))
    .orderBy(desc(verificationSamples.drawnAt))
    .limit(limit);
}
