import { eq } from "drizzle-orm";
import { hashPassword } from "@/lib/auth/password";
import type { Database } from "../client";
import * as s from "../schema";
import { CLINIC_ALTITUDE_M, CLINIC_STANDARD_DENSITY_KG_M3, seedClinic } from "./clinic";
import { seedFieldKit } from "./instruments";
import { seedLibrary } from "./library";
import { seedDemoReport } from "./report";
import { seedReviewStory } from "./review";
import { seedTerminalReadings } from "./terminal-readings";

/**
 * The demo scenario: an invented public library with two air systems, and an invented clinic
 * that only some demo users belong to. Every name, person and reading here is made up.
 */
export const DEMO_PASSWORD = "airtally-demo";

export const DEMO_ACCOUNTS = [
  { email: "tech@example.test", name: "Tomasz Reyes", role: "technician", isAdmin: false },
  { email: "cx@example.test", name: "Ines Karlsson", role: "commissioning_agent", isAdmin: false },
  { email: "engineer@example.test", name: "Dara Okafor", role: "engineer", isAdmin: false },
  { email: "owner@example.test", name: "Maren Holt", role: "owner", isAdmin: false },
  { email: "admin@example.test", name: "Sol Whitcombe", role: null, isAdmin: true },
] as const satisfies readonly { email: string; name: string; role: s.MemberRole | null; isAdmin: boolean }[];

export type Tx = Parameters<Parameters<Database["transaction"]>[0]>[0];

/**
 * Seeds the demo data once; a second call finds the demo accounts and adds nothing. With
 * `withReport` (the demo server), a last step completes the library's exhaust system and issues
 * the demo's closeout report (db/seed/report.ts) when the library has none yet; it runs through the
 * process database and needs object storage.
 */
export async function seedDemo(db: Database, options: { withReport?: boolean } = {}): Promise<{ seeded: boolean }> {
  const existing = await db.select({ id: s.users.id }).from(s.users).where(eq(s.users.email, DEMO_ACCOUNTS[0].email));
  if (existing.length > 0) {
    if (options.withReport) await reportStep();
    return { seeded: false };
  }

  const passwordHash = await hashPassword(DEMO_PASSWORD);
  await db.transaction(async (tx) => {
    const users = await tx
      .insert(s.users)
      .values(DEMO_ACCOUNTS.map((a) => ({ email: a.email, name: a.name, passwordHash, isAdmin: a.isAdmin })))
      .returning();
    const userId = (email: string) => users.find((u) => u.email === email)!.id;

    const [library] = await tx
      .insert(s.projects)
      .values({
        name: "Wrenfield Library — air balance",
        siteName: "Wrenfield Community Library",
        address: "14 Aldous Lane, Wrenfield",
        altitudeM: 210,
        unitSystem: "SI",
      })
      .returning();
    const [clinic] = await tx
      .insert(s.projects)
      .values({
        name: "Marlow Quay Clinic — fit-out",
        siteName: "Marlow Quay Clinic",
        address: "2 Quayside Row, Marlow Quay",
        altitudeM: CLINIC_ALTITUDE_M,
        unitSystem: "IP",
        standardDensityKgM3: CLINIC_STANDARD_DENSITY_KG_M3,
        // US specifications often allow outlets less below design than above (invented for the demo).
        outletToleranceMinusPct: 5,
        outletTolerancePlusPct: 10,
      })
      .returning();

    await tx.insert(s.projectMembers).values([
      ...DEMO_ACCOUNTS.filter((a) => a.role !== null).map((a) => ({
        projectId: library!.id,
        userId: userId(a.email),
        role: a.role!,
      })),
      { projectId: clinic!.id, userId: userId("engineer@example.test"), role: "engineer" as const },
    ]);

    await seedLibrary(tx, library!.id, userId("tech@example.test"), userId("cx@example.test"));
    await seedClinic(tx, clinic!.id);
    await seedFieldKit(tx, { projectId: library!.id, technicianId: userId("tech@example.test") });
    await seedTerminalReadings(tx, { projectId: library!.id, technicianId: userId("tech@example.test") });
    await seedReviewStory(tx, { projectId: library!.id, technicianId: userId("tech@example.test"), reviewerId: userId("cx@example.test") });

    await tx.insert(s.auditLog).values({
      userId: userId("admin@example.test"),
      projectId: library!.id,
      action: "demo.seeded",
      entityType: "project",
      entityId: library!.id,
      detail: { note: "Invented demo scenario" },
    });
  });
  if (options.withReport) await reportStep();
  return { seeded: true };
}

async function reportStep(): Promise<void> {
  try {
    const outcome = await seedDemoReport();
    console.log(`[demo] ${outcome.note}`);
  } catch (err) {
    // The demo stays usable without its report; say why it is missing.
    console.error("[demo] The demo closeout report could not be issued:", err);
  }
}
