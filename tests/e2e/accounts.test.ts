import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { deliverOutbox } from "@/lib/alerts/outbox";
import { closeDb } from "@/lib/db";
import { startFakeInbox, type FakeInbox, type InboxMessage } from "@/lib/mail/fake-inbox";
import { createMailTransport } from "@/lib/mail/transport";
import {
  ARTIFACTS,
  BASE_URL,
  DEMO_PASSWORD,
  launchBrowser,
  signInThroughForm,
} from "../helpers/browser";
import { appDb } from "../helpers/db";
import { Session } from "../helpers/http";

// Account e-mails end to end: the built app queues them in the outbox; the
// test delivers the outbox to a fake inbox of its own (as the worker would)
// and follows the link from the e-mail, as the person would.

let browser: Browser;
let inbox: FakeInbox;
beforeAll(async () => {
  browser = await launchBrowser();
  inbox = await startFakeInbox({ smtpPort: 0, httpPort: null });
});
afterAll(async () => {
  await browser?.close();
  await inbox?.stop();
  await closeDb();
});

/** Delivers the outbox until a message for `to` arrives (a reset link is issued just after the answer). */
async function linkFor(to: string): Promise<string> {
  const transport = createMailTransport({ host: "127.0.0.1", port: inbox.smtpPort });
  const mine = (): InboxMessage[] => inbox.messages().filter((m) => m.to.includes(to));
  for (let i = 0; i < 40 && mine().length === 0; i++) {
    await deliverOutbox(appDb(), transport);
    if (mine().length === 0) await new Promise((r) => setTimeout(r, 250));
  }
  const last = mine().at(-1);
  if (!last) throw new Error(`no e-mail reached ${to}`);
  const link = /https?:\/\/\S+\/set-password\?token=[A-Za-z0-9_-]+/.exec(last.text)?.[0];
  if (!link) throw new Error(`no link in: ${last.text}`);
  return link.replace(/^https?:\/\/[^/]+/, BASE_URL);
}

async function noSideScroll(page: Page): Promise<void> {
  const widths = await page.evaluate(() => [
    document.documentElement.scrollWidth,
    document.documentElement.clientWidth,
  ]);
  expect(widths[0]).toBeLessThanOrEqual(widths[1]!);
}

async function setPassword(page: Page, link: string, password: string): Promise<void> {
  await page.goto(link);
  await page.getByLabel("New password", { exact: true }).fill(password);
  await page.getByLabel("New password, again").fill(password);
  await page.getByRole("button", { name: "Set password" }).click();
  await page.getByTestId("password-set").waitFor();
}

describe("account e-mails", () => {
  it("an administrator invites a new user, who opens the e-mailed link, sets a password and signs in", async () => {
    const email = `invited-${Date.now()}@test.kestrel.example`;
    const admin = await browser.newContext();
    const page = await admin.newPage();
    const person = await browser.newContext({ viewport: { width: 390, height: 844 } });
    const theirs = await person.newPage();
    try {
      await signInThroughForm(page, "wren.achterberg@kestrel.example");
      await page.waitForURL(`${BASE_URL}/board`);
      await page.goto(`${BASE_URL}/admin/users/new`);
      await page.locator("form[data-ready='true']").waitFor();
      await page.getByLabel("Full name").fill("Ines Invited");
      await page.getByLabel("E-mail (sign-in)").fill(email);
      await page.getByLabel("Role").selectOption("nurse");
      await page.getByLabel(/^MICU/).check();
      await page.getByLabel("E-mail an invitation to choose a password").check();
      expect(await page.getByLabel("Initial password").count()).toBe(0);
      await page.getByLabel("Your password").fill(DEMO_PASSWORD);
      await page.getByRole("button", { name: "Create user and send invitation" }).click();
      await page.waitForURL(/\/admin\/users\/\d+$/);
      await page.getByTestId("invitation-state").getByText("Invitation pending").waitFor();

      const link = await linkFor(email);
      await theirs.goto(link);
      await theirs.getByRole("heading", { name: "Welcome, Ines Invited" }).waitFor();
      await noSideScroll(theirs);
      await theirs.screenshot({ path: `${ARTIFACTS}/set-password-390.png`, fullPage: true });
      // The rules apply: too short, then two that differ.
      await theirs.getByLabel("New password", { exact: true }).fill("short");
      await theirs.getByRole("button", { name: "Set password" }).click();
      await theirs.getByText("Password must be 12 to 200 characters.").waitFor();
      await setPassword(theirs, link, "invited-own-password");
      expect(await theirs.getByLabel("E-mail").inputValue()).toBe(email);
      await theirs.getByLabel("Password").fill("invited-own-password");
      await theirs.getByLabel("Password").press("Enter");
      await theirs.waitForURL(`${BASE_URL}/board`);

      // The link worked once.
      await theirs.goto(link);
      await theirs
        .getByTestId("link-refused")
        .getByText(/already used/)
        .waitFor();
      await page.goto(`${BASE_URL}/admin/users`);
      const row = page.getByTestId("user-row").filter({ hasText: email });
      await row.getByText("Invitation used").waitFor();
    } finally {
      await admin.close();
      await person.close();
    }
  });

  it("forgot password from the sign-in page, through the inbox, to a new password; an unknown address gets the same answer", async () => {
    const email = `forgot-${Date.now()}@test.kestrel.example`;
    const admin = await Session.signIn("kofi.marchetti@kestrel.example");
    const micu = (await appDb()("units").where({ code: "MICU" }).first("id")) as { id: number };
    const made = await admin.json("/api/v1/users", "POST", {
      email,
      name: "Fergus Forgetful",
      role: "therapist",
      unitIds: [micu.id],
      pressureUnit: "mmHg",
      password: "set-by-the-admin-1",
      currentPassword: DEMO_PASSWORD,
    });
    expect(made.status).toBe(201);
    const context = await browser.newContext();
    const page = await context.newPage();
    try {
      const ask = async (address: string) => {
        await page.goto(`${BASE_URL}/sign-in`);
        await page.getByRole("link", { name: "Forgot your password?" }).click();
        await page.waitForURL(`${BASE_URL}/forgot-password`);
        await page.getByLabel("E-mail").fill(address);
        await page.getByRole("button", { name: "E-mail me a link" }).click();
        return page.getByTestId("reset-answer").innerText();
      };
      const unknown = `nobody-${Date.now()}@test.kestrel.example`;
      const strangerAnswer = await ask(unknown);
      const knownAnswer = await ask(email);
      expect(knownAnswer).toBe(strangerAnswer);

      const link = await linkFor(email);
      expect(inbox.messages().filter((m) => m.to.includes(unknown))).toHaveLength(0);
      await setPassword(page, link, "fergus-new-password");
      await page.getByLabel("Password").fill("fergus-new-password");
      await page.getByLabel("Password").press("Enter");
      // The reset password is the user's own: straight to the Board, no forced change.
      await page.waitForURL(`${BASE_URL}/board`);
    } finally {
      await context.close();
    }
  });

  it("a password an administrator set leads to the change-password page first, and the API refuses until it is changed", async () => {
    const email = `temp-${Date.now()}@test.kestrel.example`;
    const admin = await Session.signIn("kofi.marchetti@kestrel.example");
    const micu = (await appDb()("units").where({ code: "MICU" }).first("id")) as { id: number };
    expect(
      (
        await admin.json("/api/v1/users", "POST", {
          email,
          name: "Tess Temporary",
          role: "nurse",
          unitIds: [micu.id],
          pressureUnit: "mmHg",
          password: "set-by-the-admin-2",
          currentPassword: DEMO_PASSWORD,
        })
      ).status,
    ).toBe(201);
    const api = await Session.signIn(email, "set-by-the-admin-2");
    const refused = await api.fetch("/api/v1/board");
    expect(refused.status).toBe(403);
    expect(await refused.text()).toMatch(/set by an administrator/);

    const context = await browser.newContext({ viewport: { width: 390, height: 844 } });
    const page = await context.newPage();
    try {
      await signInThroughForm(page, email, "set-by-the-admin-2");
      await page.waitForURL(`${BASE_URL}/change-password`);
      await page.getByRole("heading", { name: "Choose your own password" }).waitFor();
      await page.goto(`${BASE_URL}/board`);
      await page.waitForURL(`${BASE_URL}/change-password`);
      await noSideScroll(page);
      await page.evaluate(() => (document.documentElement.dataset.theme = "night"));
      await page.screenshot({ path: `${ARTIFACTS}/change-password-night-390.png`, fullPage: true });
      await page.getByLabel("Current password").fill("set-by-the-admin-2");
      await page.getByLabel("New password", { exact: true }).fill("set-by-the-admin-2");
      await page.getByLabel("New password, again").fill("set-by-the-admin-2");
      await page.getByRole("button", { name: "Change password" }).click();
      await page
        .getByText("Choose a password different from the one your administrator set.")
        .waitFor();
      await page.getByLabel("New password", { exact: true }).fill("tess-chose-this-one");
      await page.getByLabel("New password, again").fill("tess-chose-this-one");
      await page.getByRole("button", { name: "Change password" }).click();
      await page.waitForURL(`${BASE_URL}/board`);
      // The change ended the user's other session (the one the API client held).
      expect((await api.fetch("/api/v1/board")).status).toBe(401);
    } finally {
      await context.close();
    }
  });
});
