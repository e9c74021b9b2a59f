import { execFileSync, spawnSync } from "node:child_process";
import crypto from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { eq, sql } from "drizzle-orm";
import { PDFDocument } from "pdf-lib";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as s from "@/db/schema";
import type { LocalObjectStore } from "@/lib/cli/local-object-store";
import { issueReport, planReportIssue, ReportIssueError } from "@/lib/server/report-issue";
import { verifyReportFile } from "@/lib/server/report-verify";
import { normaliseVerificationCode } from "@/lib/server/report-codes";
import { getSigningKey, loadOrCreateKeyFile, verifyBytes } from "@/lib/server/signing";
import { getObjectBytes, objectExists } from "@/lib/server/storage";
import { demoDatabase } from "../support/db";
import { useLocalObjectStore } from "../support/object-store";
import { makeTestPdf } from "../support/pdf";

let store: LocalObjectStore;
let demo: Awaited<ReturnType<typeof demoDatabase>>;
const signers = (at = "2026-03-02T10:00:00Z") => [
  { name: "Ines Karlsson", role: "Commissioning agent", at },
  { name: "Dara Okafor", role: "Engineer of record", at },
];

beforeAll(async () => {
  store = await useLocalObjectStore();
  demo = await demoDatabase();
});
afterAll(async () => {
  await store.stop();
});

describe("issuing and verifying a report", () => {
  let first: s.Report;
  let firstPdf: Uint8Array;

  it("hashes, signs and stores the exact bytes, and a real PDF comes back from storage unchanged", async () => {
    firstPdf = await makeTestPdf("Revision one");
    first = await issueReport({ projectId: demo.library.id, pdf: firstPdf, signers: signers(), issuedBy: demo.cx.id });
    expect(first.revision).toBe(1);
    expect(first.sha256).toBe(crypto.createHash("sha256").update(firstPdf).digest("hex"));
    expect(normaliseVerificationCode(first.code)).toBe(first.code);
    const stored = await getObjectBytes(first.objectKey);
    expect(Buffer.from(stored!).equals(Buffer.from(firstPdf))).toBe(true);
    expect((await PDFDocument.load(stored!)).getPageCount()).toBe(2);
    // The signature checks with the public key alone.
    expect(verifyBytes(firstPdf, Buffer.from(first.signature, "base64"), getSigningKey().publicKeyPem)).toBe(true);
  });

  it("says an unchanged copy is valid and names the project, revision and signers", async () => {
    const answer = await verifyReportFile(firstPdf);
    expect(answer).toMatchObject({ valid: true, report: { code: first.code, project: demo.library.name, revision: 1, superseded: false, signers: [{ name: "Ines Karlsson", role: "Commissioning agent" }, { name: "Dara Okafor" }] } });
  });

  it("refuses a copy with one byte flipped", async () => {
    const changed = Uint8Array.from(firstPdf);
    changed[Math.floor(changed.length / 2)]! ^= 0x01;
    const answer = await verifyReportFile(changed);
    expect(answer.valid).toBe(false);
    expect(answer.reason).toMatch(/does not match any report issued/);
    expect(answer.report).toBeUndefined();
    expect(verifyBytes(changed, Buffer.from(first.signature, "base64"), getSigningKey().publicKeyPem)).toBe(false);
  });

  it("needs a reason for a new revision, then marks the older one superseded and still verifiable", async () => {
    const pdf = await makeTestPdf("Revision two");
    await expect(issueReport({ projectId: demo.library.id, pdf, signers: signers(), issuedBy: demo.cx.id })).rejects.toThrow(/say why/);
    const second = await issueReport({ projectId: demo.library.id, pdf, signers: signers("2026-03-09T10:00:00Z"), reason: "Branch S1.3 re-balanced and re-traversed", issuedBy: demo.cx.id });
    expect(second.revision).toBe(2);
    const old = await verifyReportFile(firstPdf);
    expect(old).toMatchObject({ valid: true, report: { revision: 1, superseded: true } });
    expect(old.reason).toMatch(/later revision/);
    expect(await verifyReportFile(pdf)).toMatchObject({ valid: true, report: { revision: 2, superseded: false } });
    const [row] = await demo.db.select().from(s.reports).where(eq(s.reports.id, first.id));
    expect(row!.supersededBy).toBe(second.id);
  });

  it("keeps issued reports unchangeable in the database itself", async () => {
    await expect(demo.db.update(s.reports).set({ sha256: "0".repeat(64) }).where(eq(s.reports.id, first.id))).rejects.toThrow();
    await expect(demo.db.delete(s.reports).where(eq(s.reports.id, first.id))).rejects.toThrow();
  });

  it("refuses a stale plan (another revision issued meanwhile) and leaves no object behind", async () => {
    const plan = await planReportIssue({ projectId: demo.library.id });
    const pdf = await makeTestPdf("Revision three");
    await issueReport({ projectId: demo.library.id, pdf, signers: signers(), reason: "Photos added", issuedBy: demo.cx.id, plan });
    const stale = { ...plan, reportId: crypto.randomUUID(), code: "AAAA-BBBB-CCCC" };
    const before = await demo.db.select({ n: sql<number>`count(*)::int` }).from(s.reports);
    const err = await issueReport({ projectId: demo.library.id, pdf: await makeTestPdf("Stale"), signers: signers(), reason: "x", issuedBy: demo.cx.id, plan: stale }).catch((e) => e);
    expect(err).toBeInstanceOf(ReportIssueError);
    expect((err as ReportIssueError).status).toBe(409);
    expect(await objectExists(`projects/${demo.library.id}/reports/${stale.reportId}/revision-${stale.revision}.pdf`)).toBe(false);
    const after = await demo.db.select({ n: sql<number>`count(*)::int` }).from(s.reports);
    expect(after[0]!.n).toBe(before[0]!.n);
  });

  it("refuses input that is not a PDF, or has no signer", async () => {
    await expect(issueReport({ projectId: demo.library.id, pdf: new TextEncoder().encode("hello"), signers: signers(), issuedBy: demo.cx.id })).rejects.toThrow(/not a PDF/);
    await expect(issueReport({ projectId: demo.library.id, pdf: await makeTestPdf(), signers: [], issuedBy: demo.cx.id })).rejects.toThrow(/signer/);
  });

  it("tells the owner, in the app and by e-mail, with the download link", async () => {
    const notes = await demo.db.select().from(s.notifications).where(eq(s.notifications.userId, demo.owner.id));
    expect(notes.filter((n) => n.kind === "report.issued").length).toBeGreaterThanOrEqual(3);
    const mails = await demo.db.select().from(s.mailMessages).where(eq(s.mailMessages.toAddress, "owner@example.test"));
    expect(mails[0]!.status).toBe("outbox");
    expect(mails.some((m) => m.text.includes(`/api/v1/projects/${demo.library.id}/reports/`) && m.text.includes("/verify/"))).toBe(true);
  });

  it("verifies offline with openssl and the public key alone", () => {
    const openssl = spawnSync("openssl", ["version"], { encoding: "utf8" });
    if (openssl.status !== 0) {
      console.warn("openssl is not installed: offline verification not exercised");
      return;
    }
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "airtally-openssl-"));
    try {
      fs.writeFileSync(path.join(dir, "airtally-public.pem"), getSigningKey().publicKeyPem);
      fs.writeFileSync(path.join(dir, "report.pdf"), firstPdf);
      fs.writeFileSync(path.join(dir, "report.sig"), Buffer.from(first.signature, "base64"));
      // The exact command the README gives.
      const ok = execFileSync("openssl", ["pkeyutl", "-verify", "-pubin", "-inkey", "airtally-public.pem", "-rawin", "-in", "report.pdf", "-sigfile", "report.sig"], { cwd: dir, encoding: "utf8" });
      expect(ok).toMatch(/Signature Verified Successfully/);
      const changed = Uint8Array.from(firstPdf);
      changed[100]! ^= 0x20;
      fs.writeFileSync(path.join(dir, "report.pdf"), changed);
      const bad = spawnSync("openssl", ["pkeyutl", "-verify", "-pubin", "-inkey", "airtally-public.pem", "-rawin", "-in", "report.pdf", "-sigfile", "report.sig"], { cwd: dir, encoding: "utf8" });
      expect(bad.status).not.toBe(0);
      expect(bad.stdout + bad.stderr).toMatch(/Signature Verification Failure/);
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe("the deployment's signing key", () => {
  it("is created once in the data directory, readable by its owner only, and read back the same", () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "airtally-key-"));
    try {
      const a = loadOrCreateKeyFile(dir);
      const b = loadOrCreateKeyFile(dir);
      expect(a.publicKeyPem).toBe(b.publicKeyPem);
      expect(a.publicKeyPem).toMatch(/^-----BEGIN PUBLIC KEY-----/);
      expect(fs.statSync(path.join(dir, "signing-key.pem")).mode & 0o777).toBe(0o600);
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });

  it("is taken from AIRTALLY_SIGNING_KEY when given, and refuses a key that is not Ed25519", () => {
    const { privateKey } = crypto.generateKeyPairSync("ed25519");
    const pem = privateKey.export({ type: "pkcs8", format: "pem" }).toString();
    const before = process.env.AIRTALLY_SIGNING_KEY;
    try {
      process.env.AIRTALLY_SIGNING_KEY = pem;
      expect(getSigningKey().publicKeyPem).toBe(crypto.createPublicKey(privateKey).export({ type: "spki", format: "pem" }).toString());
      const rsa = crypto.generateKeyPairSync("rsa", { modulusLength: 1024 }).privateKey.export({ type: "pkcs8", format: "pem" }).toString();
      process.env.AIRTALLY_SIGNING_KEY = rsa;
      expect(() => getSigningKey()).toThrow(/Ed25519/);
    } finally {
      if (before === undefined) delete process.env.AIRTALLY_SIGNING_KEY;
      else process.env.AIRTALLY_SIGNING_KEY = before;
    }
  });
});
