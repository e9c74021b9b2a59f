import fs from "node:fs";
import http from "node:http";
import path from "node:path";
import { expect, test, type APIRequestContext } from "@playwright/test";
import sharp from "sharp";
import { expectNoAxeViolations } from "./support/axe";
import { invitationPathFor, signInApi } from "./support/outbox";
import { SignInPage } from "./pages/sign-in-page";

const objectsDir = path.join(process.env.AIRTALLY_E2E_DATA_DIR!, "objects");

function countObjects(): number {
  const walk = (dir: string): number => (fs.existsSync(dir) ? fs.readdirSync(dir, { withFileTypes: true }).reduce((n, e) => n + (e.isDirectory() ? walk(path.join(dir, e.name)) : 1), 0) : 0);
  return walk(objectsDir);
}

async function photoJpeg(): Promise<Buffer> {
  return sharp({ create: { width: 1280, height: 960, channels: 3, background: { r: 90, g: 120, b: 150 } } })
    .composite([{ input: Buffer.from('<svg width="1280" height="960"><rect x="400" y="300" width="480" height="360" fill="#ddd"/></svg>'), top: 0, left: 0 }])
    .jpeg()
    .toBuffer();
}

async function librarySection(request: APIRequestContext, tag: string): Promise<{ projectId: string; sectionId: string }> {
  const projects = (await (await request.get("/api/v1/projects")).json()) as { projects: { id: string; name: string }[] };
  const library = projects.projects.find((p) => p.name.startsWith("Wrenfield Library"))!;
  const design = (await (await request.get(`/api/v1/projects/${library.id}`)).json()) as { sections: { id: string; tag: string }[] };
  return { projectId: library.id, sectionId: design.sections.find((s) => s.tag === tag)!.id };
}

test("a technician attaches a photo from a file on the Field work page and sees its thumbnail; a renamed executable is refused", async ({ page }) => {
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("tech@example.test");
  await page.getByRole("link", { name: /Wrenfield Library/ }).click();
  await page.getByRole("navigation", { name: "Project" }).getByRole("link", { name: "Field work" }).click();
  // S1.3 awaits review: its photos can still be removed (the demo's exhaust sections are approved).
  const row = page.getByRole("listitem").filter({ hasText: "S1.3 ·" }).first();
  await expect(row.getByText("No photo of this location yet.")).toBeVisible();

  const input = row.getByLabel("Add a photo of S1.3");
  await expect(input).toHaveAttribute("capture", "environment");
  await expect(input).toHaveAttribute("accept", "image/*");
  await input.setInputFiles({ name: "exhaust-port.jpg", mimeType: "image/jpeg", buffer: await photoJpeg() });
  await expect(row.getByText('"exhaust-port.jpg" saved.')).toBeVisible();
  const thumb = row.getByRole("list", { name: "Photos of S1.3" }).getByRole("img");
  await expect(thumb).toHaveCount(1);
  // Thumbnails load lazily: bring the row's into view, as the technician scrolling to it would.
  await thumb.scrollIntoViewIfNeeded();
  await expect.poll(() => thumb.evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth)).toBe(480);
  await expect(row.getByText("1 photo of this location")).toBeVisible();
  await expectNoAxeViolations(page);

  // An executable with a photo's name: the bytes decide.
  const exe = Buffer.alloc(2048);
  exe.write("MZ", 0, "latin1");
  exe.writeUInt32LE(0x80, 0x3c);
  exe.write("PE\0\0", 0x80, "latin1");
  await input.setInputFiles({ name: "holiday.jpg", mimeType: "image/jpeg", buffer: exe });
  await expect(row.getByRole("alert")).toContainText("Only JPEG or PNG files are accepted here");
  await expect(thumb).toHaveCount(1);

  // The technician who took it may remove it while the section is open.
  await row.getByRole("button", { name: "Remove" }).click();
  await expect(row.getByText("No photo of this location yet.")).toBeVisible();
});

test("an 11 MB file is refused with 413, and an upload cut off half-way leaves no row and no object", async ({ request, baseURL }) => {
  await signInApi(request, "tech@example.test");
  const { projectId, sectionId } = await librarySection(request, "X1.1");
  const url = `/api/v1/projects/${projectId}/sections/${sectionId}/photos`;
  const before = countObjects();

  const big = await request.post(url, { multipart: { file: { name: "big.jpg", mimeType: "image/jpeg", buffer: Buffer.concat([await photoJpeg(), Buffer.alloc(11 * 1024 * 1024)]) } } });
  expect(big.status()).toBe(413);
  expect(((await big.json()) as { error: { message: string } }).error.message).toMatch(/larger than 10 MB/);

  // Half a multipart body, then the connection drops.
  const cookie = (await request.storageState()).cookies.map((c) => `${c.name}=${c.value}`).join("; ");
  const boundary = "----cutoff";
  const jpeg = await photoJpeg();
  const body = Buffer.concat([Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="cut.jpg"\r\nContent-Type: image/jpeg\r\n\r\n`), jpeg, Buffer.from(`\r\n--${boundary}--\r\n`)]);
  await new Promise<void>((resolve) => {
    const req = http.request(new URL(url, baseURL), { method: "POST", headers: { cookie, "content-type": `multipart/form-data; boundary=${boundary}`, "content-length": String(body.length), origin: baseURL } });
    req.on("error", () => resolve());
    req.on("close", () => resolve());
    req.write(body.subarray(0, Math.floor(body.length / 2)), () => setTimeout(() => req.destroy(), 300));
  });
  await new Promise((r) => setTimeout(r, 1000));
  const list = (await (await request.get(url)).json()) as { photos: unknown[] };
  expect(list.photos).toEqual([]);
  expect(countObjects()).toBe(before);
});

test("another project's member cannot fetch a photo: the answer is 404", async ({ playwright, baseURL }) => {
  const tech = await playwright.request.newContext({ baseURL });
  await signInApi(tech, "tech@example.test");
  const { projectId, sectionId } = await librarySection(tech, "X1.2");
  const posted = await tech.post(`/api/v1/projects/${projectId}/sections/${sectionId}/photos`, { multipart: { file: { name: "p.jpg", mimeType: "image/jpeg", buffer: await photoJpeg() } } });
  expect(posted.status()).toBe(201);
  const { photo } = (await posted.json()) as { photo: { url: string; thumbUrl: string } };
  expect((await tech.get(photo.url)).headers()["content-type"]).toBe("image/jpeg");

  // A member of the clinic only, made through an invitation.
  const admin = await playwright.request.newContext({ baseURL });
  await signInApi(admin, "admin@example.test");
  const projects = (await (await admin.get("/api/v1/projects")).json()) as { projects: { id: string; name: string }[] };
  const clinic = projects.projects.find((p) => p.name.startsWith("Marlow Quay Clinic"))!;
  expect((await admin.post(`/api/v1/projects/${clinic.id}/invitations`, { data: { email: "clinic.only@example.test", role: "technician" } })).status()).toBe(201);
  const invitation = await invitationPathFor(admin, "clinic.only@example.test");
  const outsider = await playwright.request.newContext({ baseURL });
  const accepted = await outsider.post(`/api/v1/invitations/${invitation.split("/invite/")[1]}/accept`, { data: { name: "Clinic Only", password: "clinic-only-pass" } });
  expect(accepted.status()).toBe(201);
  for (const url of [photo.url, photo.thumbUrl, `/api/v1/projects/${projectId}/sections/${sectionId}/photos`]) {
    const res = await outsider.get(url);
    expect(res.status(), url).toBe(404);
  }
  // Signed out: 401.
  const anonymous = await playwright.request.newContext({ baseURL });
  expect((await anonymous.get(photo.url)).status()).toBe(401);
  await Promise.all([tech.dispose(), admin.dispose(), outsider.dispose(), anonymous.dispose()]);
});

test("the verification page says a downloaded report is genuine and refuses a modified copy", async ({ page }) => {
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("owner@example.test");
  await page.getByRole("link", { name: /Wrenfield Library/ }).click();
  await page.getByRole("navigation", { name: "Project" }).getByRole("link", { name: "Reports" }).click();
  await expect(page.getByText("Revision 1", { exact: true })).toBeVisible();
  await expectNoAxeViolations(page);
  const download = page.waitForEvent("download");
  await page.getByRole("link", { name: "Download the PDF of revision 1" }).click();
  const file = await (await download).path();
  const pdf = fs.readFileSync(file);
  expect(pdf.subarray(0, 5).toString("latin1")).toBe("%PDF-");
  const latest = await page.request.get(page.url().replace(/\/projects\/([^/]+)\/reports$/, "/api/v1/projects/$1/reports/latest.pdf"));
  expect(Buffer.from(await latest.body()).equals(pdf)).toBe(true);

  await page.goto("/verify");
  await expectNoAxeViolations(page);
  const chooser = page.getByLabel("The report file (PDF) to check");
  await chooser.setInputFiles({ name: "report.pdf", mimeType: "application/pdf", buffer: pdf });
  await page.getByRole("button", { name: "Check this file" }).click();
  const result = page.getByRole("region", { name: "Result" });
  await expect(result).toContainText("Genuine: this is the issued report, unchanged");
  await expect(result).toContainText("Wrenfield Library — air balance");
  await expect(result).toContainText("Ines Karlsson, Commissioning agent");
  await expect(page.getByText(/not .*professional engineer's seal|stand for a professional engineer's seal/)).toBeVisible();

  const changed = Buffer.from(pdf);
  changed[Math.floor(changed.length / 2)]! ^= 0x01;
  await chooser.setInputFiles({ name: "report-edited.pdf", mimeType: "application/pdf", buffer: changed });
  await page.getByRole("button", { name: "Check this file" }).click();
  await expect(result).toContainText("Not a genuine issued report");
  await expect(result).toContainText("does not match any report issued");

  // The code's own page: what was issued, with the signature to download.
  await chooser.setInputFiles({ name: "report.pdf", mimeType: "application/pdf", buffer: pdf });
  await page.getByRole("button", { name: "Check this file" }).click();
  await result.getByRole("link", { name: /^[0-9A-Z]{4}-[0-9A-Z]{4}-[0-9A-Z]{4}$/ }).click();
  await expect(page.getByRole("heading", { level: 1, name: /closeout report, revision 1/ })).toBeVisible();
  await expect(page.getByText("This is the current revision")).toBeVisible();
  await expectNoAxeViolations(page);
  const sig = await page.request.get(await page.getByRole("link", { name: "Download the signature file (.sig)" }).getAttribute("href").then((h) => h!));
  expect((await sig.body()).length).toBe(64);
});

test("the public API answers verification questions in its documented shape", async ({ request }) => {
  const key = await request.get("/api/v1/reports/public-key");
  expect(await key.text()).toMatch(/^-----BEGIN PUBLIC KEY-----/);
  const res = await request.post("/api/v1/reports/verify", { multipart: { file: { name: "x.pdf", mimeType: "application/pdf", buffer: Buffer.from("%PDF-1.7 not issued") } } });
  expect(res.status()).toBe(200);
  const body = (await res.json()) as Record<string, unknown>;
  expect(body.valid).toBe(false);
  expect(Object.keys(body).sort()).toEqual(["reason", "valid"]);
  const empty = await request.post("/api/v1/reports/verify", { data: { file: "x" } });
  expect(empty.status()).toBe(415);
  const noReport = await (async () => {
    await signInApi(request, "engineer@example.test");
    const projects = (await (await request.get("/api/v1/projects")).json()) as { projects: { id: string; name: string }[] };
    return request.get(`/api/v1/projects/${projects.projects.find((p) => p.name.startsWith("Marlow"))!.id}/reports/latest.pdf`);
  })();
  expect(noReport.status()).toBe(404);
  expect(((await noReport.json()) as { error: { message: string } }).error.message).toMatch(/No closeout report has been issued/);
});
