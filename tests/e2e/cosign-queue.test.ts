import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/lib/db";
import { remindCosigns } from "@/lib/orders/cosign-reminders";
import { orderFields } from "../helpers/access-fixtures";
import { ARTIFACTS, BASE_URL, launchBrowser, signInThroughForm } from "../helpers/browser";
import { admitTestPatient, appDb, SEEDED } from "../helpers/db";
import { Session } from "../helpers/http";

// The co-sign queue shows how long each verbal order has waited and whether
// its prescriber was reminded; the reminder is the worker's sweep, run here
// with a clock of the test's own.

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await closeDb();
});

describe("co-sign queue", () => {
  it("shows the wait and the reminder of a verbal order, at phone width without sideways scrolling", async () => {
    const { patientId } = await admitTestPatient("MICU");
    const prescriber = (await appDb()("users").where({ email: SEEDED.physician }).first("id")) as {
      id: number;
    };
    const nurse = await Session.signIn(SEEDED.nurse);
    const res = await nurse.json("/api/v1/orders", "POST", {
      ...orderFields(patientId),
      entryMode: "verbal",
      prescriberId: prescriber.id,
      readBackConfirmed: true,
    });
    expect(res.status).toBe(201);
    const { order } = (await res.json()) as { order: { id: number; createdAt: string } };
    // The sweep at 61 minutes after the order, as the worker would run it then.
    await remindCosigns(appDb(), new Date(Date.parse(order.createdAt) + 61 * 60_000), {
      remindMs: 60 * 60_000,
      escalateMs: 24 * 3_600_000,
    });

    const context = await browser.newContext({ viewport: { width: 390, height: 844 } });
    const page = await context.newPage();
    try {
      await signInThroughForm(page, SEEDED.physician);
      await page.waitForURL(`${BASE_URL}/board`);
      await page.goto(`${BASE_URL}/orders/cosign`);
      const row = page
        .getByTestId("cosign-row")
        .filter({ has: page.locator(`a[href="/orders/${order.id}"]`) });
      await row.getByText(/^waiting \d+ min$/).waitFor();
      await row.getByText(/reminded 1×, last/).waitFor();
      await page.screenshot({ path: `${ARTIFACTS}/cosign-queue-390.png`, fullPage: true });
      const widths = await page.evaluate(() => [
        document.body.scrollWidth,
        document.documentElement.clientWidth,
      ]);
      expect(widths[0]).toBeLessThanOrEqual(widths[1]!);
    } finally {
      await context.close();
    }
  });
});
