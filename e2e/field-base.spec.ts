import { expect, test, type Page } from "@playwright/test";
import { conditionsPanel, openFieldWork } from "./pages/field-page";
import { SignInPage } from "./pages/sign-in-page";
import { goOffline, goOnline } from "./support/network";
import { expectNoSeriousViolations } from "./support/axe";
import { apiAs } from "./support/api";

/** Types into the focused control, key by key, as a keyboard does. */
async function type(page: Page, text: string) {
  await page.keyboard.type(text);
}

const focusedName = (page: Page) => page.evaluate(() => {
  const el = document.activeElement as HTMLElement | null;
  if (!el) return "";
  const label = el.id ? document.querySelector(`label[for="${el.id}"]`)?.textContent : null;
  return (label ?? el.getAttribute("aria-label") ?? el.textContent ?? "").trim();
});

for (const viewport of [
  { width: 1024, height: 768, name: "landscape tablet" },
  { width: 820, height: 1180, name: "portrait tablet" },
]) {
  test.describe(`on a ${viewport.name} (${viewport.width}×${viewport.height})`, () => {
    test.use({ viewport: { width: viewport.width, height: viewport.height }, hasTouch: true });

    test("a technician adds an instrument to the register with the keyboard only", async ({ page }) => {
      const serial = `MM-E2E-${viewport.width}`;
      const signIn = new SignInPage(page);
      await signIn.goto();
      await signIn.signIn("tech@example.test");
      await expect(page).toHaveURL(/\/projects$/);
      await page.getByRole("link", { name: "Instruments" }).focus();
      await page.keyboard.press("Enter");
      await expect(page.getByRole("heading", { name: "Instrument register" })).toBeVisible();
      await expect(page.getByText("Calibration past due since 2 Oct 2026")).toBeVisible();
      await expectNoSeriousViolations(page);

      await page.getByRole("link", { name: "Add an instrument" }).focus();
      await page.keyboard.press("Enter");
      await expect(page.getByRole("heading", { name: "Add an instrument" })).toBeVisible();
      await expectNoSeriousViolations(page);

      // Kind stays "Manometer"; Tab from it through the fields in order.
      await page.getByLabel("Kind").focus();
      await page.keyboard.press("Tab");
      expect(await focusedName(page)).toContain("Serial number");
      await type(page, serial);
      await page.keyboard.press("Tab");
      await type(page, "Test maker");
      await page.keyboard.press("Tab");
      await type(page, "T-1");
      // Date controls take their value whole (Tab moves between their day, month and year segments).
      await page.getByLabel("Calibrated on").fill("2026-06-01");
      await page.getByLabel("Calibration due").fill("2026-05-31"); // before the calibration date: refused beside the field
      await page.getByLabel("Certificate number").focus();
      await type(page, "CAL-1");
      await page.keyboard.press("Tab");
      await type(page, "-3735");
      await page.keyboard.press("Tab");
      await type(page, "3735");
      await page.keyboard.press("Tab");
      await type(page, "1");
      await page.keyboard.press("Tab");
      await type(page, "1");
      await page.keyboard.press("Enter");

      await expect(page.getByRole("main").getByRole("alert")).toContainText("Check the field marked below.");
      await expect(page.getByText("must be after the calibration date 2026-06-01; got 2026-05-31")).toBeVisible();
      // What was typed is still there; fix the due date only.
      await expect(page.getByLabel(/Serial number/)).toHaveValue(serial);
      await page.getByLabel("Calibration due").fill("2027-06-01");
      await page.keyboard.press("Enter");

      await expect(page).toHaveURL(/\/instruments\?saved=/);
      await expect(page.getByRole("status").filter({ hasText: `Saved ${serial} in the register.` })).toBeVisible();
      const row = page.getByRole("row").filter({ hasText: serial });
      await expect(row).toContainText("Manometer");
      await expect(row).toContainText("Calibration due in");
    });

    test("a technician records the AHU's operating conditions with the keyboard only", async ({ page, playwright, baseURL }) => {
      const rpm = viewport.width === 1024 ? "1180" : "1190";
      const projectId = await openFieldWork(page);
      const panel = conditionsPanel(page, "AHU-1");
      await expect(panel.getByRole("group", { name: "Current conditions" })).toContainText("rpm · terminal units");
      await expectNoSeriousViolations(page);

      const open = panel.getByRole("button", { name: "Record changed conditions for AHU-1" });
      await open.focus();
      await page.keyboard.press("Enter");
      // The form opens in place of the button with the fan speed ready to type.
      await expect.poll(() => focusedName(page)).toContain("Fan speed");
      await type(page, rpm);
      await page.keyboard.press("Tab"); // drive frequency: this fan has no drive
      await page.keyboard.press("Tab"); // into the terminal units choice (left to their controls)
      await page.keyboard.press("ArrowRight"); // forced to maximum
      await page.keyboard.press("Tab");
      expect(await focusedName(page)).toContain("Outside-air damper");
      await type(page, "25");
      await page.keyboard.press("Tab"); // duct static set point: a constant-volume system, left empty
      await page.keyboard.press("Tab"); // filters (not checked)
      await page.keyboard.press("ArrowRight"); // wraps to "Clean"
      await page.keyboard.press("Tab");
      await type(page, "Recorded from the tablet in the plant room.");
      await expect(panel.getByRole("status").filter({ hasText: "Saved on this device" })).toBeVisible();
      await page.keyboard.press("Tab");
      expect(await focusedName(page)).toBe("Record conditions");
      await page.keyboard.press("Enter");

      await expect(panel.getByRole("group", { name: "Current conditions" })).toContainText(
        `${rpm.slice(0, 1)},${rpm.slice(1)} rpm · terminal units forced to maximum · outside-air damper 25 % open · filters clean`,
      );
      await expect(panel.getByRole("group", { name: "Current conditions" })).not.toContainText("on this device");
      await expectNoSeriousViolations(page);

      const api = await apiAs(playwright, baseURL, "owner@example.test");
      const systems = (await (await api.get(`/api/v1/projects/${projectId}`)).json()).systems as { id: string; tag: string }[];
      const ahu = systems.find((s) => s.tag === "AHU-1")!;
      const current = (await (await api.get(`/api/v1/projects/${projectId}/systems/${ahu.id}/conditions`)).json()).current;
      expect(current).toMatchObject({ fanSpeedRpm: Number(rpm), boxes: "maximum", outsideAirDamperPct: 25, ductStaticSetpointPa: null, filterState: "clean", recordedByName: "Tomasz Reyes" });
      await api.dispose();
    });
  });
}

test("the technician's new screens are usable by touch: every control at least 44 px tall", async ({ page }) => {
  await page.setViewportSize({ width: 820, height: 1180 });
  await openFieldWork(page);
  await conditionsPanel(page, "EF-1").getByRole("button", { name: /Record changed conditions/ }).click();
  // A file input is visually hidden inside its label, which is what the finger touches.
  const controls = page.locator(
    "main button, main a, main input:not([type=checkbox]):not([type=radio]):not([type=file]), main select, main label:has(input[type=radio]), main label:has(input[type=file])",
  );
  const count = await controls.count();
  expect(count).toBeGreaterThan(20);
  for (let i = 0; i < count; i++) {
    const box = await controls.nth(i).boundingBox();
    if (!box || box.height === 0) continue;
    expect(box.height, `${await controls.nth(i).evaluate((e) => e.outerHTML.slice(0, 120))}`).toBeGreaterThanOrEqual(44);
  }
});

test("an owner can read the register but sees no recording controls, and the API refuses them (403)", async ({ page, playwright, baseURL }) => {
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("owner@example.test");
  await page.getByRole("link", { name: "Instruments" }).click();
  await expect(page.getByRole("heading", { name: "Instrument register" })).toBeVisible();
  await expect(page.getByRole("link", { name: "Add an instrument" })).toHaveCount(0);
  await expect(page.getByText("Technicians and site administrators keep the register; you can read it.")).toBeVisible();
  await page.getByRole("link", { name: /Details VA-7702/ }).click();
  await expect(page.getByText("Calibration past due since 2 Oct 2026")).toBeVisible();
  await expect(page.getByRole("button", { name: /Save changes|Retire/ })).toHaveCount(0);
  await expectNoSeriousViolations(page);

  const api = await apiAs(playwright, baseURL, "owner@example.test");
  const projects = (await (await api.get("/api/v1/projects")).json()).projects as { id: string; siteName: string }[];
  const library = projects.find((p) => p.siteName === "Wrenfield Community Library")!;
  await page.goto(`/projects/${library.id}/field`);
  await expect(page.getByRole("main").getByRole("alert")).toContainText("Your role in this project does not include taking readings");
  await expect(page.getByRole("button", { name: /Record/ })).toHaveCount(0);

  const systems = (await (await api.get(`/api/v1/projects/${library.id}`)).json()).systems as { id: string }[];
  expect((await api.post(`/api/v1/projects/${library.id}/systems/${systems[0]!.id}/conditions`, { data: { fanSpeedRpm: 1000 } })).status()).toBe(403);
  expect((await api.post("/api/v1/instruments", { data: { kind: "barometer", serial: "OWNER-1" } })).status()).toBe(403);
  await api.dispose();
});

test("conditions typed without signal survive a reload and reach the server when the network returns", async ({ page, context, playwright, baseURL }) => {
  const projectId = await openFieldWork(page);
  // The service worker keeps this page for use without network once it controls it.
  await page.evaluate(async () => {
    await navigator.serviceWorker.ready;
    for (let i = 0; i < 100 && !(await caches.match(location.href)); i++) await new Promise((r) => setTimeout(r, 100));
  });
  const panel = conditionsPanel(page, "EF-1");
  await panel.getByRole("button", { name: "Record changed conditions for EF-1" }).click();
  await panel.getByLabel(/Fan speed/).fill("1395");
  await expect(panel.getByRole("status").filter({ hasText: "Saved on this device" })).toBeVisible();
  await page.waitForTimeout(300); // the device write follows the keystroke by a few milliseconds

  await goOffline(context);
  await page.reload();
  const again = conditionsPanel(page, "EF-1");
  await expect(again.getByLabel(/Fan speed/)).toHaveValue("1395");
  await expect(page.getByText("No network. Keep working")).toBeVisible();
  await again.getByLabel("Notes").fill("Recorded without signal on the roof.");
  await again.getByRole("button", { name: "Record conditions", exact: true }).click();
  await expect(again.getByRole("status").filter({ hasText: "No network: these conditions are sent when the connection returns." })).toBeVisible();
  await expect(page.getByText("1 entry is saved on this device. No network")).toBeVisible();
  await page.reload();
  const current = conditionsPanel(page, "EF-1").getByRole("group", { name: "Current conditions" });
  await expect(current).toContainText("1,395 rpm · terminal units left to their controls · filters not checked");
  await expect(current).toContainText("on this device until the server has it");

  await goOnline(context);
  await expect(current).not.toContainText("on this device", { timeout: 15_000 });
  await expect(current).toContainText("1,395 rpm");
  const api = await apiAs(playwright, baseURL, "cx@example.test");
  const systems = (await (await api.get(`/api/v1/projects/${projectId}`)).json()).systems as { id: string; tag: string }[];
  const ef = systems.find((s) => s.tag === "EF-1")!;
  const list = (await (await api.get(`/api/v1/projects/${projectId}/systems/${ef.id}/conditions`)).json()).conditions as { fanSpeedRpm: number; notes: string }[];
  expect(list.filter((c) => c.fanSpeedRpm === 1395)).toEqual([expect.objectContaining({ notes: "Recorded without signal on the roof." })]);
  await api.dispose();
});

test("today's kit: a past-due anemometer can be picked only with a reason in view, and the kit stays on the tablet", async ({ page }) => {
  await openFieldWork(page);
  const kit = page.getByRole("region", { name: "Today's kit on this tablet" });
  const reading = kit.getByRole("group", { name: "Manometer or anemometer" });
  await expect(reading.getByText("SN VA-7702")).toBeVisible();
  await reading.getByRole("radio", { name: /SN VA-7702/ }).check();
  await expect(reading.getByText("Calibration past due since 2 Oct 2026 (", { exact: false }).first()).toBeVisible();
  await expect(reading.getByText("(calibration past due since 2 Oct 2026")).toBeVisible();
  const reason = reading.getByLabel(/Why is VA-7702 used\?/);
  await reason.fill("Only vane anemometer on site; checked against the hood at SD-101.");
  await kit.getByRole("group", { name: "Pitot tube" }).getByRole("radio", { name: /SN PT-0931/ }).check();
  await page.waitForTimeout(300); // the device write follows the change by a few milliseconds
  await page.reload();
  const again = page.getByRole("region", { name: "Today's kit on this tablet" });
  await expect(again.getByRole("group", { name: "Manometer or anemometer" }).getByRole("radio", { name: /SN VA-7702/ })).toBeChecked();
  await expect(again.getByRole("group", { name: "Pitot tube" }).getByRole("radio", { name: /SN PT-0931/ })).toBeChecked();
  await expect(again.getByLabel(/Why is VA-7702 used\?/)).toHaveValue("Only vane anemometer on site; checked against the hood at SD-101.");
  await expectNoSeriousViolations(page);
});
