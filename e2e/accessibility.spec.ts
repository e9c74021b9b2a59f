import AxeBuilder from "@axe-core/playwright";
import { expect, test, type Page } from "@playwright/test";
import { SignInPage } from "./pages/sign-in-page";

// WCAG 2.1 AA rules, colour contrast among them: screens are read in bright plant rooms.
async function expectNoViolations(page: Page) {
  // After a client-side navigation (and the refresh that follows sign-in) the title is streamed in a
  // moment after the content, replacing the old one: let the page settle, then check it is there.
  await page.waitForLoadState("networkidle");
  await expect(page).toHaveTitle(/\S/);
  const results = await new AxeBuilder({ page }).withTags(["wcag2a", "wcag2aa", "wcag21a", "wcag21aa"]).analyze();
  expect(results.violations.map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(" ")).join(", ")}`)).toEqual([]);
}

test("the sign-in page meets WCAG 2.1 AA", async ({ page }) => {
  await new SignInPage(page).goto();
  await expectNoViolations(page);
});

const SCREENS = [
  { email: "tech@example.test", tab: "Field work" },
  { email: "cx@example.test", tab: "Review" },
  { email: "engineer@example.test", tab: "Design vs measured" },
  { email: "admin@example.test", tab: "Members" },
];

for (const { email, tab } of SCREENS) {
  test(`the overview and ${tab} screens meet WCAG 2.1 AA`, async ({ page }) => {
    const signIn = new SignInPage(page);
    await signIn.goto();
    await signIn.signIn(email);
    await expectNoViolations(page);
    await page.getByRole("link", { name: /Wrenfield Library/ }).click();
    await expect(page.getByRole("navigation", { name: "Project" })).toBeVisible();
    await expectNoViolations(page);
    await page.getByRole("navigation", { name: "Project" }).getByRole("link", { name: tab }).click();
    await expect(page.getByRole("link", { name: tab })).toHaveAttribute("aria-current", "page");
    // The new page's title replaces the old one a moment after its content: wait for it, not just any title.
    await expect(page).toHaveTitle(new RegExp(`^${tab}`));
    await expectNoViolations(page);
  });
}
