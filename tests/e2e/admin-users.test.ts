import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ARTIFACTS, BASE_URL, launchBrowser, signInThroughForm } from "../helpers/browser";
import { Session } from "../helpers/http";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("admin manages users", () => {
  it("creates a user from the keyboard, sees field errors first, and the table sorts", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    try {
      await signInThroughForm(page, "wren.achterberg@kestrel.example");
      await page.waitForURL(`${BASE_URL}/board`);
      await page.goto(`${BASE_URL}/admin/users/new`);

      // Submitting an empty form shows errors beside the fields, in words.
      await page.getByRole("button", { name: "Create user" }).click();
      await page.getByText("Name must be 2 to 120 characters.").waitFor();
      await page.getByText("Assign at least one unit.").waitFor();
      expect(await page.getByLabel("Full name").getAttribute("aria-invalid")).toBe("true");

      const email = `e2e-${Date.now()}@test.kestrel.example`;
      await page.getByLabel("Full name").fill("Ottilie Brennan");
      await page.getByLabel("E-mail (sign-in)").fill(email);
      await page.getByLabel("Role").selectOption("therapist");
      await page.getByLabel("RESP · Respiratory Ward").check();
      await page.getByLabel("Initial password").fill("short");
      await page.getByLabel("Initial password").press("Enter");
      await page.getByText(/Password must be 12 to 200 characters/).waitFor();
      // What was typed is kept after a refusal.
      expect(await page.getByLabel("Full name").inputValue()).toBe("Ottilie Brennan");
      await page.getByLabel("Initial password").fill("a-proper-password");
      // Account changes are confirmed with the administrator's own password.
      await page.getByLabel("Your password").fill("tidemark-demo");
      await page.getByLabel("Initial password").press("Enter");
      await page.waitForURL(/\/admin\/users\/\d+$/);
      await page.getByRole("heading", { name: "Ottilie Brennan" }).waitFor();

      await page.goto(`${BASE_URL}/admin/users`);
      const table = page.getByTestId("users-table");
      await table.waitFor();
      const firstName = () => page.getByTestId("user-row").first().locator("th").innerText();
      const ascending = await firstName();
      await page.getByRole("button", { name: /^Name/ }).click();
      await expect.poll(firstName).not.toBe(ascending);
      expect(await table.locator("th[aria-sort='descending']").count()).toBe(1);
      await page.screenshot({ path: `${ARTIFACTS}/admin-users-day.png`, fullPage: true });

      await page.getByRole("radio", { name: "Night theme" }).click();
      expect(await page.evaluate(() => document.documentElement.dataset.theme)).toBe("night");
      await page.reload();
      expect(await page.evaluate(() => document.documentElement.dataset.theme)).toBe("night");
      await page.screenshot({ path: `${ARTIFACTS}/admin-users-night.png`, fullPage: true });
      await page.goto(`${BASE_URL}/board`);
      await page.getByRole("heading", { name: "Board", level: 1 }).waitFor();
      await page.screenshot({ path: `${ARTIFACTS}/board-night.png`, fullPage: true });
    } finally {
      await context.close();
    }
  });

  it("deactivates a user with a reason; the user can no longer sign in", async () => {
    const stamp = Date.now();
    const email = `leaver-${stamp}@test.kestrel.example`;
    const name = `Leopold Leaver ${stamp}`;
    const api = await Session.signIn("kofi.marchetti@kestrel.example");
    const created = await api.json("/api/v1/users", "POST", {
      email,
      name,
      role: "reviewer",
      unitIds: [1],
      pressureUnit: "mmHg",
      password: "leaver-password-1",
      rationale: "",
      currentPassword: "tidemark-demo",
    });
    expect(created.status).toBe(201);
    const context = await browser.newContext();
    const page = await context.newPage();
    try {
      await signInThroughForm(page, "wren.achterberg@kestrel.example");
      await page.waitForURL(`${BASE_URL}/board`);
      await page.goto(`${BASE_URL}/admin/users`);
      await page.getByRole("link", { name }).click();
      await page.getByRole("button", { name: "Deactivate…" }).click();
      const dialog = page.getByRole("dialog");
      await dialog.getByRole("button", { name: "Deactivate" }).click();
      await dialog.getByText(/Give a reason/).waitFor();
      await dialog.getByLabel(/Reason/).fill("Moved to another hospital");
      await dialog.getByLabel("Your password").fill("tidemark-demo");
      await dialog.getByRole("button", { name: "Deactivate" }).click();
      await page.getByText("Deactivated", { exact: true }).waitFor();

      const other = await browser.newContext();
      const otherPage = await other.newPage();
      await signInThroughForm(otherPage, email, "leaver-password-1");
      await otherPage.getByText(/do not match an active account/).waitFor();
      await other.close();
    } finally {
      await context.close();
    }
  });
});
