import { expect, test } from "@playwright/test";
import { expectNoAxeViolations } from "./support/axe";
import { SignInPage } from "./pages/sign-in-page";

const NEW_PERSON = "maeve.ostrander@example.test";
const NEW_PASSWORD = "duct-static-412";

test("an invitation appears in the outbox, and its link sets a password once and never again", async ({ page, browser }) => {
  // Three people in turn, each in their own browser, with an accessibility check on every new screen.
  test.setTimeout(120_000);
  // The engineer invites a commissioning agent from the Members page.
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("engineer@example.test");
  await page.getByRole("link", { name: /Wrenfield Library/ }).click();
  await page.getByRole("navigation", { name: "Project" }).getByRole("link", { name: "Members" }).click();
  await expect(page.getByRole("heading", { name: "Invite someone" })).toBeVisible();
  await expectNoAxeViolations(page);
  const invite = page.getByRole("region", { name: "Invite someone" });
  await invite.getByLabel("E-mail").fill(NEW_PERSON);
  await invite.getByLabel("Role").selectOption("commissioning_agent");
  await invite.getByRole("button", { name: "Send invitation" }).click();
  await expect(invite.getByText(`Invitation sent to ${NEW_PERSON}`)).toBeVisible();
  await expect(page.getByRole("region", { name: "Open invitations" })).toContainText(NEW_PERSON);

  // The site administrator reads it in the outbox and follows its link, in a fresh browser.
  const admin = await browser.newContext();
  const adminPage = await admin.newPage();
  const adminSignIn = new SignInPage(adminPage);
  await adminSignIn.goto();
  await adminSignIn.signIn("admin@example.test");
  await adminPage.getByRole("link", { name: "Outbox" }).click();
  await expect(adminPage.getByRole("heading", { name: "Outbox", level: 1 })).toBeVisible();
  await expectNoAxeViolations(adminPage);
  const message = adminPage.getByRole("region", { name: /Invitation to Wrenfield Library/ }).filter({ hasText: NEW_PERSON }).first();
  await expect(message).toContainText("works once");
  const link = await message.getByRole("link", { name: /\/invite\// }).getAttribute("href");
  await admin.close();

  const guest = await browser.newContext();
  const invitee = await guest.newPage();
  await invitee.goto(link!);
  await expect(invitee.getByRole("heading", { name: "Join Wrenfield Library — air balance" })).toBeVisible();
  await expect(invitee.getByText(NEW_PERSON)).toBeVisible();
  await expectNoAxeViolations(invitee);
  await invitee.getByLabel("Your name").fill("Maeve Ostrander");
  await invitee.getByLabel(/Choose a password/).fill("short");
  await invitee.getByLabel("The same password again").fill("short");
  await invitee.getByRole("button", { name: "Create my account" }).click();
  await expect(invitee.getByText("Use at least 12 characters.")).toBeVisible();
  await invitee.getByLabel(/Choose a password/).fill(NEW_PASSWORD);
  await invitee.getByLabel("The same password again").fill(NEW_PASSWORD);
  await invitee.getByRole("button", { name: "Create my account" }).click();
  await expect(invitee.getByRole("heading", { level: 1, name: "Wrenfield Library — air balance" })).toBeVisible();
  await expect(invitee.getByText("Your role: Commissioning agent")).toBeVisible();

  // The same link never works again, signed in or not.
  await invitee.goto(link!);
  await expect(invitee.getByRole("heading", { name: "This invitation cannot be used" })).toBeVisible();
  await expect(invitee.getByRole("alert").filter({ hasText: "already been used" })).toBeVisible();
  await expect(invitee.getByLabel(/Choose a password/)).toHaveCount(0);
  const again = await invitee.request.post(`/api/v1/invitations/${encodeURIComponent(link!.split("/invite/")[1]!)}/accept`, { data: { name: "Intruder", password: "another-password-1" } });
  expect(again.status()).toBe(410);
  await guest.close();

  // The password chosen is the account's password.
  const later = await browser.newContext();
  const laterPage = await later.newPage();
  const laterSignIn = new SignInPage(laterPage);
  await laterSignIn.goto();
  await laterSignIn.signIn(NEW_PERSON, NEW_PASSWORD);
  await expect(laterPage).toHaveURL(/\/projects$/);
  await later.close();
});

test("the bell counts unread notifications in words and figures, and the inbox marks them read", async ({ page }) => {
  // The owner was told of the report issued before the run.
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("owner@example.test");
  const bell = page.getByRole("link", { name: /^Notifications: \d+ unread$/ });
  await expect(bell).toBeVisible();
  await expect(bell).toContainText(/\d+ new/);
  await bell.click();
  await expect(page.getByRole("heading", { name: "Notifications", level: 1 })).toBeVisible();
  await expect(page.getByText(/closeout report revision 1 issued/)).toBeVisible();
  await expectNoAxeViolations(page);
  await page.getByRole("button", { name: "Mark all as read" }).click();
  await expect(page.getByText("Nothing unread.")).toBeVisible();
  await expect(page.getByRole("link", { name: "Notifications: none unread" })).toBeVisible();
});

test("the TAB supervisor is designated on the Members page and signs the statement there", async ({ page, browser }) => {
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("engineer@example.test");
  await page.getByRole("link", { name: /Wrenfield Library/ }).click();
  await page.getByRole("navigation", { name: "Project" }).getByRole("link", { name: "Members" }).click();
  const card = page.getByRole("region", { name: "TAB supervisor" });
  // The demo's report step designated and signed already: the form sits behind "Change the designation".
  await expect(card.getByRole("heading", { name: "TAB supervisor" })).toBeVisible();
  const change = card.getByText("Change the designation");
  if ((await change.count()) > 0) await change.click();
  await card.getByLabel("Technician").selectOption({ label: "Tomasz Reyes" });
  await card.getByLabel("Certifying body").fill("Wrenfield Balancing Board");
  await card.getByLabel("Certificate number").fill("TB-0417");
  // A new certificate number needs a new signature.
  await card.getByRole("button", { name: /^(Designate as TAB supervisor|Save the designation)$/ }).click();
  await expect(card.getByText("Not signed yet")).toBeVisible();
  await expect(card.getByText(/certificate number TB-0417/)).toBeVisible();

  const tech = await browser.newContext();
  const techPage = await tech.newPage();
  const techSignIn = new SignInPage(techPage);
  await techSignIn.goto();
  await techSignIn.signIn("tech@example.test");
  await techPage.getByRole("link", { name: /Wrenfield Library/ }).click();
  await techPage.getByRole("navigation", { name: "Project" }).getByRole("link", { name: "Members" }).click();
  const mine = techPage.getByRole("region", { name: "TAB supervisor" });
  await expectNoAxeViolations(techPage);
  await mine.getByLabel(/I have reviewed the data/).check();
  await mine.getByLabel("Your password, to sign").fill("not my password");
  await mine.getByRole("button", { name: "Sign the statement" }).click();
  await expect(mine.getByText("That is not your password; the statement was not signed.")).toBeVisible();
  await mine.getByLabel("Your password, to sign").fill("airtally-demo");
  await mine.getByRole("button", { name: "Sign the statement" }).click();
  await expect(mine.getByText(/^Signed \d{4}-/)).toBeVisible();
  await tech.close();
});
