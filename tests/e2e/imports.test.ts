import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/lib/db";
import { ARTIFACTS, BASE_URL, launchBrowser, signInThroughForm } from "../helpers/browser";
import { admitTestPatient, appDb } from "../helpers/db";
import { Session } from "../helpers/http";

const PHYSICIAN = "ines.varga@kestrel.example"; // MICU and RESP
const THERAPIST = "jonah.pell@kestrel.example"; // MICU

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await closeDb();
});

describe("uploads", () => {
  it("a therapist uploads a blood gas CSV, reads the rejected row, imports the good one, and a re-upload changes nothing", async () => {
    // A patient of this test's own, admitted two hours ago, with an order in effect.
    const { patientId } = await admitTestPatient("MICU");
    await appDb()("admissions")
      .where({ patient_id: patientId })
      .update({ admitted_at: new Date(Date.now() - 2 * 3600_000) });
    const { mrn } = (await appDb()("patients").where({ id: patientId }).first("mrn")) as {
      mrn: string;
    };
    const physician = await Session.signIn(PHYSICIAN);
    const order = await physician.json("/api/v1/orders", "POST", {
      entryMode: "written",
      password: "tidemark-demo",
      patientId,
      device: "venturi_mask",
      spo2Lower: 92,
      spo2Upper: 96,
      fio2Min: 0.24,
      fio2Max: 0.6,
      initialFio2: 0.35,
      reassessMinutes: 60,
      rationale: "Upload e2e",
      supersedesOrderId: null,
    });
    expect(order.status, await order.clone().text()).toBe(201);

    const sampled = new Date(Date.now() - 30 * 60_000).toISOString();
    const csv = [
      "MRN,Sampled at,Sample type,pH,PaO2 (mmHg),PaCO2 (mmHg),SaO2 (%),Hb (g/dL),FiO2",
      `${mrn},${sampled},arterial,7.39,71,41,93.5,12.1,0.35`,
      `ZZ-NOBODY,${sampled},arterial,7.40,80,40,95,12.0,0.35`,
    ].join("\n");
    const file = { name: `gases-${patientId}.csv`, mimeType: "text/csv", buffer: Buffer.from(csv) };

    const context = await browser.newContext({ viewport: { width: 1024, height: 900 } });
    const page = await context.newPage();
    try {
      await signInThroughForm(page, THERAPIST);
      await page.waitForURL(`${BASE_URL}/board`);
      await page.getByRole("link", { name: "Uploads" }).click();
      await page.waitForURL(`${BASE_URL}/imports`);
      await page.getByLabel("The file holds").selectOption({ label: "Blood gas results (CSV)" });
      await page.getByLabel("File", { exact: true }).setInputFiles(file);
      await page.getByRole("button", { name: "Upload and check" }).click();

      const preview = page.getByRole("region", {
        name: new RegExp(`Preview: gases-${patientId}\\.csv`),
      });
      await preview.waitFor();
      const text = await preview.innerText();
      expect(text).toContain("ZZ-NOBODY");
      expect(text).toMatch(/ZZ-NOBODY[\s\S]*not an admitted patient on MICU/);
      // The good row cannot be imported before the rejected one is acknowledged as read.
      const importButton = preview.getByRole("button", { name: "Import 1 row" });
      expect(await importButton.isDisabled()).toBe(true);
      await preview.getByLabel(/I have read the 1 rejected row/).check();
      await importButton.click();
      await page
        .getByRole("region", { name: new RegExp(`Imported: gases-${patientId}\\.csv`) })
        .waitFor();
      await page.screenshot({ path: `${ARTIFACTS}/uploads-imported.png`, fullPage: true });

      const gases = (await appDb()("blood_gases")
        .where({ patient_id: patientId })
        .select("pao2_mmhg")) as {
        pao2_mmhg: number;
      }[];
      expect(gases.map((g) => Number(g.pao2_mmhg))).toEqual([71]);

      // The same file again: recognised by its hash, nothing written.
      await page.goto(`${BASE_URL}/imports`);
      await page.getByLabel("The file holds").selectOption({ label: "Blood gas results (CSV)" });
      await page.getByLabel("File", { exact: true }).setInputFiles(file);
      await page.getByRole("button", { name: "Upload and check" }).click();
      await page.getByText(/This file was imported before/).waitFor();
      expect(
        await appDb()("blood_gases").where({ patient_id: patientId }).count({ n: "*" }),
      ).toEqual([{ n: 1 }]);
    } finally {
      await context.close();
    }
  });
});
