import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ARTIFACTS, BASE_URL, launchBrowser, signInThroughForm } from "../helpers/browser";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const ROLE_STORIES = [
  {
    role: "physician",
    email: "ines.varga@kestrel.example",
    label: "Physician",
    units: ["MICU", "RESP"],
  },
  {
    role: "therapist",
    email: "jonah.pell@kestrel.example",
    label: "Respiratory therapist",
    units: ["MICU"],
  },
  { role: "nurse", email: "greta.sorensen@kestrel.example", label: "Nurse", units: ["RESP"] },
  {
    role: "reviewer",
    email: "rafael.ostrowski@kestrel.example",
    label: "Reviewer",
    units: ["RESP"],
  },
  {
    role: "admin",
    email: "kofi.marchetti@kestrel.example",
    label: "Administrator",
    units: ["MICU", "RESP"],
  },
] as const;

describe.each(ROLE_STORIES)("$role", ({ role, email, label, units }) => {
  it(`signs in, sees the Board of their own units, and only their role's pages`, async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    try {
      await signInThroughForm(page, email);
      // Each role's home: a reviewer lands on Reports, everyone else on the Board.
      if (role === "reviewer") {
        await page.waitForURL(`${BASE_URL}/reports`);
        await page.getByRole("heading", { name: "Reports", level: 1 }).waitFor();
        await page.getByRole("link", { name: "Board", exact: true }).click();
      }
      await page.waitForURL(`${BASE_URL}/board`);
      await expect.poll(() => page.getByTestId("current-user").innerText()).toContain(label);
      await page.getByRole("heading", { name: "Board", level: 1 }).waitFor();
      for (const code of ["MICU", "RESP"]) {
        const shown = await page
          .getByRole("heading", { level: 2, name: new RegExp(`\\(${code}\\)`) })
          .count();
        expect(shown, `${code} section`).toBe((units as readonly string[]).includes(code) ? 1 : 0);
      }
      expect(await page.getByTestId("board-row").count()).toBeGreaterThan(0);
      await page.screenshot({ path: `${ARTIFACTS}/${role}-board-day.png`, fullPage: true });

      const response = await page.goto(`${BASE_URL}/admin/users`);
      if (role === "admin") {
        expect(response?.status()).toBe(200);
        await page.getByTestId("users-table").waitFor();
        expect(await page.getByRole("link", { name: "Users" }).count()).toBe(1);
      } else {
        expect(response?.status()).toBe(403);
        await page.getByRole("heading", { name: "Not available to your role" }).waitFor();
        expect(await page.getByRole("link", { name: "Users" }).count()).toBe(0);
        // The refusal keeps the header: the Board is one click away in the navigation.
        expect(
          await page
            .getByRole("navigation", { name: "Main" })
            .getByRole("link", { name: "Board" })
            .count(),
        ).toBe(1);
      }
      await page.screenshot({ path: `${ARTIFACTS}/${role}-admin-users.png` });
    } finally {
      await context.close();
    }
  });
});

describe("sign-in page", () => {
  it("shows the same message for a wrong password and for an unknown e-mail", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    try {
      const messages: string[] = [];
      for (const [email, password] of [
        ["hana.whitlock@kestrel.example", "wrong-password"],
        ["nobody-here@kestrel.example", "wrong-password"],
      ] as const) {
        await signInThroughForm(page, email, password);
        const alert = page.getByRole("alert").filter({ hasText: /./ });
        await alert.waitFor();
        messages.push(await alert.innerText());
      }
      expect(messages[0]).toMatch(/do not match an active account/);
      expect(messages[1]).toBe(messages[0]);
      expect(page.url()).toContain("/sign-in");
    } finally {
      await context.close();
    }
  });

  it("sends a visitor without a session to sign-in, and back after signing in", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    try {
      await page.goto(`${BASE_URL}/admin/users`);
      await page.waitForURL(/\/sign-in\?callbackUrl=/);
      await page.getByLabel("E-mail").fill("wren.achterberg@kestrel.example");
      await page.getByLabel("Password").fill("tidemark-demo");
      await page.getByRole("button", { name: "Sign in" }).click();
      await page.waitForURL(`${BASE_URL}/admin/users`);
      await page.getByRole("button", { name: "Sign out" }).click();
      await page.waitForURL(/\/sign-in/);
      await page.goto(`${BASE_URL}/board`);
      await page.waitForURL(/\/sign-in/);
    } finally {
      await context.close();
    }
  });
});
