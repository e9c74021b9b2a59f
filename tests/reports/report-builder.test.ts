import crypto from "node:crypto";
import fs from "node:fs";
import { and, eq } from "drizzle-orm";
import { PDFDocument } from "pdf-lib";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as s from "@/db/schema";
import { getLatestReport } from "@/db/queries/reports";
import { seedDemoReport } from "@/db/seed/report";
import type { LocalObjectStore } from "@/lib/cli/local-object-store";
import { approveReport, buildDraftReport, getReportReadiness, issueProjectReport, ReportFlowError } from "@/lib/server/report-approvals";
import { verifyReportFile } from "@/lib/server/report-verify";
import { getObjectBytes, putObject } from "@/lib/server/storage";
import sharp from "sharp";
import { DRAFT_MARK } from "@/lib/report/render";
import { demoDatabase } from "../support/db";
import { useLocalObjectStore } from "../support/object-store";
import { readPdfText } from "./pdf-text";

let store: LocalObjectStore;
let demo: Awaited<ReturnType<typeof demoDatabase>>;
let issuedPdf: Uint8Array;
let issued: s.Report;

beforeAll(async () => {
  store = await useLocalObjectStore();
  demo = await demoDatabase();
  // A photo of the X1.1 traverse location in object storage, as an upload leaves it.
  const [x11] = await demo.db
    .select({ id: s.ductSections.id })
    .from(s.ductSections)
    .innerJoin(s.airSystems, eq(s.airSystems.id, s.ductSections.systemId))
    .where(and(eq(s.airSystems.projectId, demo.library.id), eq(s.ductSections.tag, "X1.1")));
  const jpeg = await sharp({ create: { width: 640, height: 480, channels: 3, background: { r: 150, g: 160, b: 170 } } }).jpeg().toBuffer();
  const key = `projects/${demo.library.id}/sections/${x11!.id}/photos/test.jpg`;
  await putObject({ key, body: jpeg, contentType: "image/jpeg" });
  await demo.db.insert(s.photos).values({ projectId: demo.library.id, sectionId: x11!.id, objectKey: key, contentType: "image/jpeg", bytes: jpeg.length, width: 640, height: 480, caption: "Ports above the corridor ceiling", takenBy: demo.tech.id });
  const outcome = await seedDemoReport();
  expect(outcome.issued).toBe(true);
  issued = (await getLatestReport({ projectId: demo.library.id }))!;
  issuedPdf = (await getObjectBytes(issued.objectKey))!;
  if (process.env.AIRTALLY_REPORT_OUT) fs.writeFileSync(`${process.env.AIRTALLY_REPORT_OUT}/issued.pdf`, issuedPdf);
}, 120_000);
afterAll(async () => {
  await store.stop();
});

describe("the demo's issued report", () => {
  it("is a PDF that pdf-lib reopens, with the demo's page count", async () => {
    const doc = await PDFDocument.load(issuedPdf);
    // Cover, certification, contents, summary, five approved traverse parts of one page each (S1.1,
    // S1.2, X1, X1.1, X1.2), outlets and terminal units, continuity, instruments, photos, cautions,
    // verification sample, approvals: counted from the demo's data.
    expect(doc.getPageCount()).toBe(16);
  });

  it("prints the running header, n of N and the verification link on every page, and no draft mark", async () => {
    const pages = await readPdfText(issuedPdf);
    pages.forEach((page, i) => {
      expect(page.text).toContain("Closeout report · Wrenfield Library — air balance");
      expect(page.text).toContain(`Page ${i + 1} of ${pages.length}`);
      expect(page.text).toContain(`/verify/${issued.code}`);
      expect(page.text).toContain(`Revision 1 · ${issued.code}`);
      expect(page.text).not.toContain(DRAFT_MARK);
    });
    const all = pages.map((p) => p.text).join(" ");
    // Approved data only; the supply system's unapproved sections are listed, never dropped.
    expect(all).toContain("Not approved — excluded");
    expect(all).toContain("Traverse EF-1 / X1.1");
    // The supply branches S1.1 and S1.2 are approved; its trunk S1 and S1.3 are not.
    expect(all).toContain("Traverse AHU-1 / S1.1");
    expect(all).not.toMatch(/Traverse AHU-1 \/ S1 /);
    expect(all).not.toContain("Traverse AHU-1 / S1.3");
    // The demo's verification sample of the approved reading-room branches (db/seed/review.ts).
    expect(all).toMatch(/Verification sample Verified by Ines Karlsson, 2026-11-24 Sample 2 of 2 items \(100 %\) Tolerance ±10 % Result Passed/);
    expect(all).toContain("AHU-1 · S1.1 1,412 1,456 3.1 % Agrees");
    expect(all).toContain("No accepted deviations.");
    expect(all).toContain("air side only");
    expect(all).toContain("Guild of Air Balancing Supervisors");
    // The photo of the traverse location, embedded with its caption.
    expect(all).toContain("EF-1 / X1.1: Ports above the corridor ceiling");
    expect(all).not.toContain("No photos of traverse locations were attached.");
    expect(all).not.toContain("The image could not be read.");
    const doc = await PDFDocument.load(issuedPdf);
    const photoPage = doc.getPages()[pages.findIndex((p) => p.text.includes("Photos of traverse locations Closeout") || p.text.startsWith("Photos of traverse locations"))]!;
    expect(photoPage.node.Resources()?.toString()).toMatch(/\/XObject/);
  });

  it("carries a signature that verifies with the public key alone, and one flipped byte fails", async () => {
    const publicKey = crypto.createPublicKey(issued.publicKeyPem);
    expect(crypto.verify(null, issuedPdf, publicKey, Buffer.from(issued.signature, "base64"))).toBe(true);
    const changed = Uint8Array.from(issuedPdf);
    changed[Math.floor(changed.length / 3)]! ^= 0x01;
    expect(crypto.verify(null, changed, publicKey, Buffer.from(issued.signature, "base64"))).toBe(false);
    expect(await verifyReportFile(issuedPdf)).toMatchObject({ valid: true, report: { revision: 1, superseded: false } });
    expect((await verifyReportFile(changed)).valid).toBe(false);
  });
});

describe("a draft", () => {
  it("marks every page as not issued and has no verification code", async () => {
    const draft = await buildDraftReport({ projectId: demo.library.id });
    if (process.env.AIRTALLY_REPORT_OUT) fs.writeFileSync(`${process.env.AIRTALLY_REPORT_OUT}/draft.pdf`, draft);
    const pages = await readPdfText(draft);
    expect(pages.length).toBeGreaterThan(16);
    pages.forEach((page, i) => {
      expect(page.text).toContain(DRAFT_MARK);
      expect(page.text).toContain(`Page ${i + 1} of ${pages.length}`);
      expect(page.text).not.toMatch(/Verification code [0-9A-Z]{4}-/);
    });
    // Data in every state, labelled.
    const all = pages.map((p) => p.text).join(" ");
    expect(all).toContain("Traverse AHU-1 / S1");
    expect(all).toContain("Submitted, awaiting review");
  });

  it("lists the engineer of record's standing accepted deviations with their reasons, and not withdrawn ones", async () => {
    const [s13] = await demo.db
      .select({ id: s.ductSections.id })
      .from(s.ductSections)
      .innerJoin(s.airSystems, eq(s.airSystems.id, s.ductSections.systemId))
      .where(and(eq(s.airSystems.projectId, demo.library.id), eq(s.ductSections.tag, "S1.3")));
    const row = { projectId: demo.library.id, subject: "section" as const, entityId: s13!.id, measure: "design", label: "S1.3 · % of design", valueUnit: "% of design", tolerance: "±10 %", acceptedBy: demo.engineer.id, acceptedByName: demo.engineer.name };
    await demo.db.insert(s.acceptedDeviations).values([
      { ...row, acceptedValue: 84.2, reason: "Children's library is under-occupied this term; rebalance at the autumn check." },
      { ...row, measure: "design-old", acceptedValue: 80, reason: "An earlier acceptance, since withdrawn.", withdrawnAt: new Date(), withdrawnByName: demo.engineer.name, withdrawReason: "Superseded." },
    ]);
    const all = (await readPdfText(await buildDraftReport({ projectId: demo.library.id }))).map((p) => p.text).join(" ");
    expect(all).toContain("S1.3 · % of design (band ±10 %) 84 %");
    expect(all).toContain("Children's library is under-occupied this term");
    expect(all).not.toContain("An earlier acceptance, since withdrawn.");
  });
});

describe("issuing", () => {
  it("refuses with the blockers in words while approvals and the supervisor's statement are missing", async () => {
    const refusal = await issueProjectReport({ projectId: demo.clinic.id, user: demo.engineer }).catch((e: unknown) => e);
    expect(refusal).toBeInstanceOf(ReportFlowError);
    const err = refusal as ReportFlowError;
    expect(err.status).toBe(409);
    expect(err.blockers!.join(" ")).toMatch(/No TAB supervisor is designated/);
    expect(err.blockers!.join(" ")).toMatch(/commissioning agent has not approved/);
    expect(err.blockers!.join(" ")).toMatch(/engineer of record has not approved/);
  });

  it("voids an approval when the data change after it", async () => {
    await approveReport({ projectId: demo.library.id, user: demo.cx, role: "commissioning_agent" });
    await approveReport({ projectId: demo.library.id, user: demo.engineer, role: "engineer" });
    const before = await getReportReadiness({ projectId: demo.library.id });
    expect(before).toMatchObject({ ready: true, revision: 2 });
    // The commissioning agent approves the supply trunk's traverse: the report's content changes.
    const [s1] = await demo.db
      .select({ t: s.traverses })
      .from(s.traverses)
      .innerJoin(s.ductSections, eq(s.ductSections.id, s.traverses.sectionId))
      .innerJoin(s.airSystems, eq(s.airSystems.id, s.ductSections.systemId))
      .where(and(eq(s.airSystems.projectId, demo.library.id), eq(s.ductSections.tag, "S1")));
    await demo.db.update(s.traverses).set({ status: "approved" }).where(eq(s.traverses.id, s1!.t.id));
    await demo.db.insert(s.reviews).values({ traverseId: s1!.t.id, reviewerId: demo.cx.id, decision: "approved", traverseVersion: s1!.t.version });
    const after = await getReportReadiness({ projectId: demo.library.id });
    expect(after.ready).toBe(false);
    expect(after.fingerprint).not.toBe(before.fingerprint);
    expect(after.approvals.every((a) => a.approval !== null && !a.current)).toBe(true);
    expect(after.blockers.join(" ")).toMatch(/no longer counts: the data changed since/);
    await expect(issueProjectReport({ projectId: demo.library.id, user: demo.engineer, reason: "Supply trunk approved." })).rejects.toMatchObject({ status: 409 });
  });

  it("asks for a reason from revision 2, then issues it, and the first revision says it is superseded", async () => {
    await approveReport({ projectId: demo.library.id, user: demo.cx, role: "commissioning_agent" });
    await approveReport({ projectId: demo.library.id, user: demo.engineer, role: "engineer" });
    await expect(issueProjectReport({ projectId: demo.library.id, user: demo.engineer })).rejects.toMatchObject({ status: 400, fields: { reason: expect.any(String) } });
    const second = await issueProjectReport({ projectId: demo.library.id, user: demo.engineer, reason: "The supply trunk's traverse was approved." });
    expect(second.revision).toBe(2);
    expect(second.signers.map((x) => x.role)).toEqual(["TAB supervisor", "Commissioning agent", "Engineer of record"]);
    expect(await verifyReportFile(issuedPdf)).toMatchObject({ valid: true, report: { revision: 1, superseded: true } });
    const text = (await readPdfText((await getObjectBytes(second.objectKey))!)).map((p) => p.text).join(" ");
    expect(text).toContain("The supply trunk's traverse was approved.");
    expect(text).toContain("Traverse AHU-1 / S1");
  });
});
