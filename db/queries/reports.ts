import "server-only";
import { and, desc, eq, isNull } from "drizzle-orm";
import { getDb } from "../client";
import { projects, reports, type Report } from "../schema";

/** Every issued revision of a project's report, newest first. */
export async function listReports({ projectId }: { projectId: string }): Promise<Report[]> {
  const db = await getDb();
  return db.select().from(reports).where(eq(reports.projectId, projectId)).orderBy(desc(reports.revision));
}

/** The current (not superseded) issued report of a project, if any. */
export async function getLatestReport({ projectId }: { projectId: string }): Promise<Report | null> {
  const db = await getDb();
  const [row] = await db
    .select()
    .from(reports)
    .where(and(eq(reports.projectId, projectId), isNull(reports.supersededBy)))
    .orderBy(desc(reports.revision))
    .limit(1);
  return row ?? null;
}

export async function getReport({ projectId, reportId }: { projectId: string; reportId: string }): Promise<Report | null> {
  const db = await getDb();
  const [row] = await db.select().from(reports).where(and(eq(reports.projectId, projectId), eq(reports.id, reportId)));
  return row ?? null;
}

/** An issued report by its verification code, with its project's name and the revision that replaced it. */
export async function getReportByCode({ code }: { code: string }) {
  const db = await getDb();
  const [row] = await db
    .select({ report: reports, projectName: projects.name, siteName: projects.siteName })
    .from(reports)
    .innerJoin(projects, eq(projects.id, reports.projectId))
    .where(eq(reports.code, code));
  if (!row) return null;
  const successor = row.report.supersededBy ? (await db.select({ revision: reports.revision, code: reports.code }).from(reports).where(eq(reports.id, row.report.supersededBy)))[0] ?? null : null;
  return { ...row, successor };
}

/** Issued reports whose bytes hash to this SHA-256 (hex), with their projects' names. */
export async function findReportsBySha256({ sha256 }: { sha256: string }) {
  const db = await getDb();
  return db
    .select({ report: reports, projectName: projects.name })
    .from(reports)
    .innerJoin(projects, eq(projects.id, reports.projectId))
    .where(eq(reports.sha256, sha256));
}
