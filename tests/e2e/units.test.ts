import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  ARTIFACTS,
  BASE_URL,
  DEMO_PASSWORD,
  launchBrowser,
  signInThroughForm,
} from "../helpers/browser";
import { Session } from "../helpers/http";

const ADMIN = "wren.achterberg@kestrel.example";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

type ListedUnit = { id: number; code: string; beds: number; occupiedBeds: number };

/** An admin's units as the API lists them. */
async function units(email = ADMIN, password = DEMO_PASSWORD): Promise<ListedUnit[]> {
  const api = await Session.signIn(email, password);
  const res = await api.fetch("/api/v1/units");
  expect(res.status).toBe(200);
  return ((await res.json()) as { units: ListedUnit[] }).units;
}

describe("admin manages units and beds", () => {
  it("adds a bed from the keyboard, and is refused retiring an occupied one", async () => {
    const micu = (await units()).find((u) => u.code === "MICU")!;
    expect(micu.occupiedBeds).toBeGreaterThan(0);
    const context = await browser.newContext();
    const page = await context.newPage();
    try {
      await signInThroughForm(page, ADMIN);
      await page.waitForURL(`${BASE_URL}/board`);
      // The admin navigation leads to the units.
      await page.getByRole("link", { name: "Units", exact: true }).click();
      await page.waitForURL(`${BASE_URL}/admin/units`);
      await page.getByTestId("units-table").waitFor();
      await page.getByRole("link", { name: "MICU · Medical ICU" }).click();
      await page.waitForURL(`${BASE_URL}/admin/units/${micu.id}`);
      await page.locator("form[data-ready='true']").first().waitFor();

      // An empty label is refused beside the field, in words.
      const labelField = page.getByLabel("New bed label");
      await labelField.focus();
      await labelField.press("Enter");
      await page.getByText("Bed label must be 1 to 16 characters.").waitFor();
      expect(await labelField.getAttribute("aria-invalid")).toBe("true");

      const label = `E${Date.now().toString(36).slice(-6).toUpperCase()}`;
      await labelField.pressSequentially(label);
      await labelField.press("Enter");
      await page.getByTestId(`bed-${label}`).waitFor();
      await page.getByText(`Bed ${label} added.`).waitFor();
      // The field is empty and focused again, ready for the next bed.
      expect(await labelField.inputValue()).toBe("");
      expect(await labelField.evaluate((el) => el === document.activeElement)).toBe(true);

      // The same label again is a refusal naming it.
      await labelField.pressSequentially(label);
      await labelField.press("Enter");
      await page.getByText(`MICU already has a bed ${label}; choose another label.`).waitFor();

      // An occupied bed cannot be retired: the refusal names the bed and the patient.
      const occupied = page
        .locator("[data-testid^='bed-']")
        .filter({ hasText: "Occupied" })
        .first();
      const bedLabel = (await occupied.locator("th").innerText()).trim();
      const retire = page.getByRole("button", { name: `Retire bed ${bedLabel}` });
      await retire.focus();
      await retire.press("Enter");
      const refusal = page.getByRole("alert").filter({ hasText: "cannot be retired" });
      await refusal.waitFor();
      expect(await refusal.innerText()).toMatch(
        new RegExp(`Bed ${bedLabel} cannot be retired: [A-Z]\\.[A-Z]\\. \\(MRN \\w+\\)`),
      );
      expect(await occupied.innerText()).toContain("Occupied");

      // The empty new bed retires, and can be restored.
      await page.getByRole("button", { name: `Retire bed ${label}` }).click();
      await page.getByText(`Bed ${label} retired.`).waitFor();
      await page.getByRole("button", { name: `Restore bed ${label}` }).click();
      await page.getByText(`Bed ${label} restored.`).waitFor();
      await page.screenshot({ path: `${ARTIFACTS}/admin-unit-beds.png`, fullPage: true });

      const after = (await units()).find((u) => u.code === "MICU")!;
      expect(after.beds).toBe(micu.beds + 1);
    } finally {
      await context.close();
    }
  });

  it("creates a unit after naming the fields out of range, and lands on its empty bed list", async () => {
    // A fresh administrator, so the seeded ones keep their two units.
    const email = `units-admin-${Date.now()}@test.kestrel.example`;
    const micu = (await units()).find((u) => u.code === "MICU")!;
    const kofi = await Session.signIn("kofi.marchetti@kestrel.example");
    const made = await kofi.json("/api/v1/users", "POST", {
      email,
      name: "Unit Builder",
      role: "admin",
      unitIds: [micu.id],
      pressureUnit: "mmHg",
      password: DEMO_PASSWORD,
      currentPassword: DEMO_PASSWORD,
    });
    expect(made.status).toBe(201);
    // A password an administrator set must be changed before anything else.
    const own = await Session.signIn(email);
    const changed = await own.json("/api/v1/me/password", "POST", {
      currentPassword: DEMO_PASSWORD,
      password: "unit-builder-own-1",
      confirmPassword: "unit-builder-own-1",
    });
    expect(changed.status).toBe(200);
    const context = await browser.newContext();
    const page = await context.newPage();
    try {
      await signInThroughForm(page, email, "unit-builder-own-1");
      await page.waitForURL(`${BASE_URL}/board`);
      await page.goto(`${BASE_URL}/admin/units/new`);
      await page.locator("form[data-ready='true']").waitFor();
      const code = `E2E${Date.now().toString(36).slice(-6).toUpperCase()}`;
      await page.getByLabel("Code", { exact: true }).fill(code);
      await page.getByLabel("Name", { exact: true }).fill("Surgical Step-down");
      await page.getByLabel("Altitude (m)").fill("6000");
      await page.getByLabel("Time zone").fill("Europe/Atlantis");
      await page.getByLabel("First shift starts at").fill("7:00");
      await page.getByLabel("First shift starts at").press("Enter");
      await page
        .getByText("Altitude must be a whole number of metres from -500 to 5500.")
        .waitFor();
      await page.getByText("Time zone must be an IANA name such as Europe/Amsterdam.").waitFor();
      await page.getByText("Shift start must be a time from 00:00 to 23:59 (HH:MM).").waitFor();

      await page.getByLabel("Altitude (m)").fill("250");
      await page.getByLabel("Time zone").fill("Europe/Amsterdam");
      await page.getByLabel("First shift starts at").fill("06:30");
      await page.getByLabel("Shift length").selectOption("8");
      await page.getByLabel("Invasive ventilation").uncheck();
      await page.getByLabel("First shift starts at").press("Enter");
      await page.waitForURL(/\/admin\/units\/\d+$/);
      await page.getByRole("heading", { name: `${code} · Surgical Step-down` }).waitFor();
      await page.getByText(`${code} has no beds yet`).waitFor();

      // The creator is a member of the new unit: the API lists it among theirs.
      const created = (await units(email, "unit-builder-own-1")).find((u) => u.code === code);
      expect(created).toMatchObject({ beds: 0, occupiedBeds: 0 });
    } finally {
      await context.close();
    }
  });
});
