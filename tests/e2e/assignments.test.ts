import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import { hashPassword } from "@/lib/auth/password";
import { shiftAt } from "@/lib/units/shifts";
import {
  ARTIFACTS,
  BASE_URL,
  DEMO_PASSWORD,
  launchBrowser,
  signInThroughForm,
} from "../helpers/browser";
import { appDb } from "../helpers/db";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

/** Presses Tab (or Shift+Tab) until the focused element matches the selector, as a keyboard user would. */
async function tabTo(page: Page, selector: string, key: "Tab" | "Shift+Tab" = "Tab") {
  for (let i = 0; i < 150; i++) {
    await page.keyboard.press(key);
    const there = await page.evaluate(
      (sel) => document.activeElement?.matches(sel) ?? false,
      selector,
    );
    if (there) return;
  }
  throw new Error(`Tab never reached ${selector}`);
}

/** A unit with two beds, a charge nurse of the current shift and two more nurses, all on it alone. */
async function smallUnit(): Promise<{ chargeEmail: string }> {
  const knex = appDb();
  const tag = randomUUID().slice(0, 6).toUpperCase();
  const [unitId] = await knex("units").insert({
    code: `KA${tag}`,
    name: `Keyboard ward ${tag}`,
    kind: "ward",
    altitude_m: 0,
    time_zone: "UTC",
    shift_start: "07:00",
    shift_hours: 12,
    devices_json: JSON.stringify(["room_air", "nasal_cannula"]),
  });
  await knex("beds").insert([
    { unit_id: unitId, label: "K1", sort_order: 1 },
    { unit_id: unitId, label: "K2", sort_order: 2 },
  ]);
  const hash = await hashPassword(DEMO_PASSWORD);
  const emails = ["charge", "nurse-a", "nurse-b"].map(
    (who) => `${who}-${tag.toLowerCase()}@test.kestrel.example`,
  );
  const ids: number[] = [];
  for (const [i, email] of emails.entries()) {
    const [id] = await knex("users").insert({
      email,
      name: `Nurse ${"ABC"[i]} ${tag}`,
      role: "nurse",
      password_hash: hash,
    });
    await knex("user_units").insert({ user_id: id, unit_id: unitId });
    ids.push(Number(id));
  }
  const shift = shiftAt({ timeZone: "UTC", shiftStart: "07:00", shiftHours: 12 }, new Date());
  await knex("unit_charge_duties").insert({
    unit_id: unitId,
    user_id: ids[0],
    starts_at: shift.startsAt,
    ends_at: shift.endsAt,
  });
  return { chargeEmail: emails[0]! };
}

describe("shift assignments", () => {
  it("the charge nurse assigns the next shift's nurse of a bed by keyboard; it stays after a reload", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    try {
      // A small unit of its own, with a charge nurse for the current shift: the grid does not
      // depend on the hundreds of beds and users the other tests leave on the seeded units.
      const { chargeEmail } = await smallUnit();
      await signInThroughForm(page, chargeEmail);
      await page.waitForURL(`${BASE_URL}/board`);
      await page.goto(`${BASE_URL}/assignments`);
      await page.getByRole("heading", { name: /^Current shift/ }).waitFor();
      await page.getByText("You may edit this shift as the unit's charge nurse").waitFor();

      await tabTo(page, "a[href*='shift=next']");
      await page.keyboard.press("Enter");
      await page.waitForURL(/shift=next/);
      await page.getByRole("heading", { name: /^Next shift/ }).waitFor();
      await page.locator("form[data-ready='true']").waitFor();

      const cell = page.getByLabel("K1 nurse");
      const id = (await cell.getAttribute("id"))!;
      const before = await cell.inputValue();
      await tabTo(page, `#${id}`);
      // Arrow keys change a closed native select; up from the seeded nurse, down from "Nobody".
      await page.keyboard.press(before === "" ? "ArrowDown" : "ArrowUp");
      const chosen = await cell.inputValue();
      expect(chosen).not.toBe(before);
      const chosenName = await cell.evaluate(
        (el) => (el as HTMLSelectElement).selectedOptions[0]?.textContent ?? "",
      );

      // Save sits above the grid: back from the cell.
      await tabTo(page, "button[type='submit']", "Shift+Tab");
      await page.keyboard.press("Enter");
      await page
        .getByRole("status")
        .filter({ hasText: /Saved: 1 change/ })
        .waitFor();
      await page.screenshot({ path: `${ARTIFACTS}/assignments-next-shift.png`, fullPage: true });

      await page.reload();
      await page.locator("form[data-ready='true']").waitFor();
      expect(await page.getByLabel("K1 nurse").inputValue()).toBe(chosen);
      expect(chosenName.length).toBeGreaterThan(0);
    } finally {
      await context.close();
    }
  });

  it("shows another nurse the grid read-only, saying who assigns", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    try {
      await signInThroughForm(page, "felix.adeyemi@kestrel.example");
      await page.waitForURL(`${BASE_URL}/board`);
      await page.goto(`${BASE_URL}/assignments`);
      await page
        .getByText("Only the unit's charge nurse of the current shift or an administrator")
        .waitFor();
      expect(await page.locator("select[id^='cell-']").count()).toBe(0);
      expect(await page.getByRole("button", { name: "Save" }).count()).toBe(0);
    } finally {
      await context.close();
    }
  });
});
