import { expect, test, type Page } from "@playwright/test";
import { SignInPage } from "./pages/sign-in-page";

async function openLibraryTab(page: Page, email: string, tab: string) {
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn(email);
  await page.getByRole("link", { name: /Wrenfield Library/ }).click();
  await page.getByRole("navigation", { name: "Project" }).getByRole("link", { name: tab }).click();
  await expect(page.getByRole("link", { name: tab })).toHaveAttribute("aria-current", "page");
  // Only the open tab is marked, not the overview whose path prefixes it.
  await expect(page.getByRole("navigation", { name: "Project" }).locator('[aria-current="page"]')).toHaveCount(1);
}

test("the technician's field work shows the safety cautions, suggested layouts and where each section stands", async ({ page }) => {
  await openLibraryTab(page, "tech@example.test", "Field work");
  await expect(page.getByRole("heading", { name: "Work safely" })).toBeVisible();
  await expect(page.getByText(/lock out and tag out/)).toBeVisible();
  // 1200 × 600 mm trunk: ASHRAE log-Tchebycheff rule, > 914 mm → 7 lines, < 762 mm → 5 points.
  const trunk = page.getByRole("listitem").filter({ hasText: "S1 ·" }).first();
  await expect(trunk).toContainText("7 lines × 5 points (log-Tchebycheff)");
  await expect(trunk).toContainText("Awaiting review");
  // The demo's exhaust system is fully approved (its closeout report is issued).
  await expect(page.getByRole("listitem").filter({ hasText: "X1 ·" }).first()).toContainText("Approved");
});

test("the commissioning agent's review queue lists the submitted traverses with their results", async ({ page }) => {
  await openLibraryTab(page, "cx@example.test", "Review");
  await expect(page.getByRole("heading", { name: "Review queue" })).toBeVisible();
  await expect(page.getByRole("list", { name: "Counts per status" })).toContainText("Awaiting review2");
  const trunk = page.getByRole("row", { name: /AHU-1 \/ S1 Traverse/ });
  await expect(trunk).toContainText("Good plane");
  // The expanded uncertainty, always with its coverage factor.
  await expect(trunk).toContainText(/± \d+\.\d % \(k = 2, about 95 %\)/);
  await trunk.getByRole("button", { name: /Review/ }).click();
  await expect(page.getByText("Standard flow", { exact: true })).toBeVisible();
  // The demo's sample of the approved reading-room branches, with the agent's readings.
  const sample = page.getByRole("region", { name: /AHU-1/ });
  await expect(sample).toContainText("seed 2026112401");
  await expect(sample).toContainText("All 2 sampled items read: 2 agree");
});

test("the engineer of record sees design against measured, continuity by mass and balancing aids", async ({ page }) => {
  await openLibraryTab(page, "engineer@example.test", "Design vs measured");
  const supply = page.getByRole("region").filter({ hasText: "AHU-1 · Reading rooms supply" });
  await expect(supply.getByRole("row").filter({ hasText: "S1.3" }).first()).toContainText("Outside band");
  await expect(supply).toContainText("S1 → S1.1 + S1.2 + S1.3");
  await expect(supply).toContainText("compare mass flows, not volumes");
  await expect(supply).toContainText("Reference: leave fully open");
  await expect(supply).toContainText("would reach design (fan laws)");
  await expect(page.getByRole("region").filter({ hasText: "EF-1" })).toContainText("X1 → X1.1 + X1.2");
  await expect(supply).toContainText("qualified person");
});

test("the owner's reports screen shows readiness and the cautions every report carries", async ({ page }) => {
  await openLibraryTab(page, "owner@example.test", "Reports");
  await expect(page.getByText("Readiness: 5 of 7 duct sections approved, 2 awaiting review, 0 not yet traversed.")).toBeVisible();
  await expect(page.getByRole("heading", { name: "Every report carries these cautions" })).toBeVisible();
});

test("every control a technician taps is at least 44 px tall", async ({ page }) => {
  await openLibraryTab(page, "tech@example.test", "Field work");
  const controls = page.locator("header a, header button, header label, nav a, main button");
  const count = await controls.count();
  expect(count).toBeGreaterThan(5);
  for (let i = 0; i < count; i++) {
    const box = await controls.nth(i).boundingBox();
    if (!box) continue; // visually hidden
    expect(box.height, `control ${i}: ${await controls.nth(i).innerText()}`).toBeGreaterThanOrEqual(44);
  }
});
