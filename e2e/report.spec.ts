import fs from "node:fs";
import { expect, test } from "@playwright/test";
import { readPdfText } from "../tests/reports/pdf-text";
import { expectNoAxeViolations } from "./support/axe";
import { SignInPage } from "./pages/sign-in-page";

async function openReports(page: import("@playwright/test").Page, email: string) {
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn(email);
  await page.getByRole("link", { name: /Wrenfield Library/ }).click();
  await page.getByRole("navigation", { name: "Project" }).getByRole("link", { name: "Reports" }).click();
}

test("the owner downloads the demo's closeout report, the verification page says it is genuine, and a modified copy is refused", async ({ page }) => {
  test.setTimeout(60_000);
  await openReports(page, "owner@example.test");
  await expect(page.getByText("Revision 1", { exact: true })).toBeVisible();
  const projectId = page.url().match(/\/projects\/([^/]+)\/reports$/)![1]!;
  const latest = await page.request.get(`/api/v1/projects/${projectId}/reports/latest.pdf`);
  expect(latest.status()).toBe(200);
  const pdf = Buffer.from(await latest.body());
  const pages = await readPdfText(pdf);
  expect(pages.length).toBe(16);
  const code = latest.headers()["x-airtally-verification-code"]!;
  for (const [i, p] of pages.entries()) {
    expect(p.text).toContain(`Page ${i + 1} of ${pages.length}`);
    expect(p.text).toContain(`/verify/${code}`);
  }
  expect(pages[0]!.text).toContain("Air-side test and balance closeout report");

  await page.goto("/verify");
  const chooser = page.getByLabel("The report file (PDF) to check");
  await chooser.setInputFiles({ name: "report.pdf", mimeType: "application/pdf", buffer: pdf });
  await page.getByRole("button", { name: "Check this file" }).click();
  const result = page.getByRole("region", { name: "Result" });
  await expect(result).toContainText("Genuine: this is the issued report, unchanged");
  await expect(result).toContainText("Dara Okafor, Engineer of record");
  await expect(result).toContainText("Tomasz Reyes, TAB supervisor");

  const changed = Buffer.from(pdf);
  changed[Math.floor(changed.length / 2)]! ^= 0x01;
  await chooser.setInputFiles({ name: "report-edited.pdf", mimeType: "application/pdf", buffer: changed });
  await page.getByRole("button", { name: "Check this file" }).click();
  await expect(result).toContainText("Not a genuine issued report");
});

test("the engineer downloads a draft, sees what blocks the next revision, and cannot issue it yet", async ({ page }) => {
  // The draft is built on request from the whole project's data: allow for a busy machine.
  test.setTimeout(90_000);
  await openReports(page, "engineer@example.test");
  const checklist = page.getByRole("list", { name: "Readiness checklist" });
  await expect(checklist).toContainText("Engineer of record's approval: missing");
  // (The supervisor's line depends on the people journey, which re-designates the supervisor in parallel.)
  await expect(checklist).toContainText("TAB supervisor's certification signed");
  await expect(page.getByRole("button", { name: "Issue revision 2" })).toBeDisabled();
  await expectNoAxeViolations(page);
  // For looking at the page as its users do: AIRTALLY_SCREENSHOTS=<dir> keeps a picture per screen size.
  const shots = process.env.AIRTALLY_SCREENSHOTS;
  if (shots) {
    for (const [width, height] of [[1024, 768], [820, 1180], [1440, 900]] as const) {
      await page.setViewportSize({ width, height });
      await page.screenshot({ path: `${shots}/reports-${width}x${height}.png`, fullPage: true });
    }
  }
  const download = page.waitForEvent("download");
  await page.getByRole("link", { name: "Download a draft (PDF)" }).click();
  const pdf = fs.readFileSync(await (await download).path());
  const pages = await readPdfText(pdf);
  expect(pages.length).toBeGreaterThan(16);
  for (const p of pages) expect(p.text).toContain("Draft — not issued");

  // The API says the same in words, and refuses the issue with the blockers.
  const projectId = page.url().match(/\/projects\/([^/]+)\/reports$/)![1]!;
  const readiness = (await (await page.request.get(`/api/v1/projects/${projectId}/reports/readiness`)).json()) as { readiness: { ready: boolean; revision: number; blockers: string[] } };
  expect(readiness.readiness).toMatchObject({ ready: false, revision: 2 });
  const refused = await page.request.post(`/api/v1/projects/${projectId}/reports`, { data: { reason: "Trying early." }, headers: { origin: new URL(page.url()).origin } });
  expect(refused.status()).toBe(409);
  expect(((await refused.json()) as { blockers: string[] }).blockers).toEqual(expect.arrayContaining(readiness.readiness.blockers.filter((b) => /approved/.test(b))));
});
