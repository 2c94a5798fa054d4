import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  barometricPressureAtAltitude,
  ENGINE_VERSION,
  PEEP_NOT_FORECAST,
  SOURCES,
} from "@/lib/oxygen";
import type { AssessResponse, ForecastResponse } from "@/lib/oxygenation/evaluate";
import { ARTIFACTS, BASE_URL, launchBrowser, signInThroughForm } from "../helpers/browser";
import { Session } from "../helpers/http";

const PHYSICIAN = "ines.varga@kestrel.example"; // MICU and RESP
const MICU_NURSE = "hana.whitlock@kestrel.example"; // MICU only
const RESP_PATIENT_ID = 11; // the demo seed admits patients 11–26 to RESP

type ApiErrorBody = { error: { message: string; fieldErrors?: Record<string, string[]> } };

// Ventilated at sea level: P/F = 80 / 0.4 = 200 mmHg (Horovitz 1974);
// PAO2 = 0.4 × (760 − 47) − 40 / 0.8 = 235.2 mmHg (simplified alveolar gas equation).
const BLOOD_GAS = {
  fio2: 0.4,
  pao2: 80,
  paco2: 40,
  hemoglobin: 12,
  spo2: 95,
  peep: 10,
  support: "invasive",
};

describe("api/v1/oxygenation", () => {
  let physician: Session;
  beforeAll(async () => {
    physician = await Session.signIn(PHYSICIAN);
  });

  it("assesses a blood gas for a signed-in user, every index with its unit and basis", async () => {
    const res = await physician.json("/api/v1/oxygenation/assess", "POST", BLOOD_GAS);
    expect(res.status).toBe(200);
    const body = (await res.json()) as AssessResponse;
    expect(body.engineVersion).toBe(ENGINE_VERSION);
    expect(body.pressureUnit).toBe("mmHg");
    expect(body.input.barometricPressure).toBe(760);
    const { pfRatio, alveolarPO2, oxygenContent } = body.assessment.indices;
    expect(pfRatio.value).toBeCloseTo(200, 10);
    expect(pfRatio.unit).toBe("mmHg");
    expect(pfRatio.basis).toMatchObject({ formula: "P/F = PaO2 / FiO2", source: SOURCES.pfRatio });
    expect(pfRatio.basis.inputs.PaO2).toEqual({ value: 80, unit: "mmHg" });
    expect(alveolarPO2.value).toBeCloseTo(235.2, 10);
    expect(alveolarPO2.basis.assumptions.length).toBeGreaterThan(0);
    expect(oxygenContent?.total.unit).toBe("mL/dL");
    // Berlin 2012: 100 < P/F ≤ 200 with PEEP ≥ 5 cmH2O, intubated → moderate.
    expect(body.assessment.classification.berlin.category).toBe("moderate");
    expect(body.assessment.classification.berlin.criterion).toMatch(/P\/F 200/);
    expect(Array.isArray(body.assessment.caveats)).toBe(true);
  });

  it("takes kPa and g/L, and the barometric pressure of the caller's unit", async () => {
    const res = await physician.json("/api/v1/oxygenation/assess", "POST", {
      ...BLOOD_GAS,
      pressureUnit: "kPa",
      pao2: 10.67,
      paco2: 5.33,
      hemoglobin: 120,
      hemoglobinUnit: "g/L",
      unitId: 1,
    });
    expect(res.status).toBe(200);
    const body = (await res.json()) as AssessResponse;
    expect(body.pressureUnit).toBe("kPa");
    // 10.67 kPa × 7.50062 = 80.0 mmHg; 120 g/L = 12 g/dL.
    expect(body.input.pao2).toBeCloseTo(80.03, 1);
    expect(body.input.hemoglobin).toBeCloseTo(12, 10);
    // The demo units sit at 40 m: ICAO standard atmosphere, about 756.4 mmHg.
    expect(body.input.barometricPressure).toBeCloseTo(barometricPressureAtAltitude(40), 10);
    expect(body.barometricPressure.basis.source).toBe(SOURCES.icaoAtmosphere);
  });

  it("answers 404 for a unit outside the caller's", async () => {
    const nurse = await Session.signIn(MICU_NURSE);
    const res = await nurse.json("/api/v1/oxygenation/assess", "POST", { ...BLOOD_GAS, unitId: 2 });
    expect(res.status).toBe(404);
  });

  it("refuses a malformed body with an error beside each field, in the unit typed", async () => {
    const res = await physician.json("/api/v1/oxygenation/assess", "POST", {
      pressureUnit: "kPa",
      fio2: 40,
      pao2: "high",
      paco2: 50,
    });
    expect(res.status).toBe(400);
    const { error } = (await res.json()) as ApiErrorBody;
    expect(error.fieldErrors?.fio2).toEqual([
      "FiO2 must be between 0.21 and 1 (a fraction: 0.4 for 40 %).",
    ]);
    expect(error.fieldErrors?.pao2).toEqual(["PaO2 must be a number."]);
    expect(error.fieldErrors?.paco2).toEqual(["PaCO2 must be between 1.34 and 19.99 kPa."]);

    const notJson = await physician.json("/api/v1/oxygenation/assess", "POST", "{ fio2: ");
    expect(notJson.status).toBe(400);
  });

  it("turns an engine refusal into a 400 naming the field", async () => {
    // On room air, PaCO2 140 mmHg leaves no alveolar oxygen (alveolar gas equation).
    const res = await physician.json("/api/v1/oxygenation/assess", "POST", {
      fio2: 0.21,
      pao2: 50,
      paco2: 140,
    });
    expect(res.status).toBe(400);
    const { error } = (await res.json()) as ApiErrorBody;
    expect(error.fieldErrors?.paco2?.[0]).toMatch(
      /^PaCO2 must be between 10 and 118 mmHg: .*leaves no alveolar oxygen/,
    );
  });

  it("forecasts a FiO2 change by three models with a range and a basis for each", async () => {
    const res = await physician.json("/api/v1/oxygenation/forecast", "POST", {
      fio2: 0.4,
      pao2: 80,
      paco2: 40,
      hemoglobin: 12,
      nextFio2: 0.3,
    });
    expect(res.status).toBe(200);
    const body = (await res.json()) as ForecastResponse;
    expect(body.engineVersion).toBe(ENGINE_VERSION);
    const { range, models, caveats } = body.forecast;
    expect(range.low.pao2).toBeLessThanOrEqual(range.high.pao2);
    for (const model of Object.values(models)) {
      expect(model.pao2).toBeGreaterThanOrEqual(range.low.pao2);
      expect(model.pao2).toBeLessThanOrEqual(range.high.pao2);
    }
    // Constant P/F: 200 mmHg × 0.3 = 60 mmHg.
    expect(models.pf.pao2).toBeCloseTo(60, 10);
    expect(caveats).toContain(PEEP_NOT_FORECAST);
    expect(body.basis.shunt.source).toContain(SOURCES.shunt);
    expect(body.basis.pf.formula).toMatch(/PaO2 new/);
  });

  it("refuses a malformed forecast with field errors", async () => {
    const res = await physician.json("/api/v1/oxygenation/forecast", "POST", {
      fio2: 0.4,
      pao2: 80,
      paco2: 40,
      nextFio2: 30,
    });
    expect(res.status).toBe(400);
    const { error } = (await res.json()) as ApiErrorBody;
    expect(error.fieldErrors?.hemoglobin).toEqual(["Enter Haemoglobin."]);
    expect(error.fieldErrors?.nextFio2).toEqual([
      "Proposed FiO2 must be between 0.21 and 1 (a fraction: 0.4 for 40 %).",
    ]);
  });

  it.each(["assess", "forecast"])("answers 401 to %s without a session", async (route) => {
    const res = await new Session().json(`/api/v1/oxygenation/${route}`, "POST", BLOOD_GAS);
    expect(res.status).toBe(401);
    const { error } = (await res.json()) as ApiErrorBody;
    expect(error.message).toMatch(/Sign in/);
  });
});

describe("the Chart's blood-gas evaluation", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("lets the physician open a patient from the Board and evaluate a blood gas by keyboard", async () => {
    const context = await browser.newContext({ viewport: { width: 1024, height: 768 } });
    const page = await context.newPage();
    try {
      await signInThroughForm(page, PHYSICIAN);
      await page.waitForURL(`${BASE_URL}/board`);
      await page
        .getByTestId("board-row")
        .first()
        .getByRole("link", { name: /open the Chart/ })
        .click();
      await page.waitForURL(/\/patients\/\d+$/);
      await page.getByRole("heading", { level: 2, name: "Evaluate a blood gas" }).waitFor();
      expect(await page.getByTestId("patient-facts").innerText()).toMatch(
        /MRN[\s\S]*Bed[\s\S]*Unit/,
      );
      // A patient with an arterial gas opens with it evaluated; one without says so.
      const note = page.getByText(/^Opened with the latest arterial gas, sampled /);
      const none = page.getByText("No arterial gas recorded in this admission");
      await note.or(none).first().waitFor();
      if (await note.count()) await page.getByTestId("oxygenation-index").first().waitFor();

      // Keyboard only: select what is there and type over it, Tab on, Enter to submit.
      const type = async (text: string) => {
        await page.keyboard.press("Control+A");
        await page.keyboard.type(text);
      };
      await page.getByLabel("FiO2 (%)", { exact: true }).focus();
      await type("21");
      await page.keyboard.press("Tab");
      await type("50");
      await page.keyboard.press("Tab");
      await type("140");
      await page.keyboard.press("Enter");
      // Refused by the engine on the server: the error sits beside PaCO2, the values stay.
      await page.getByText(/PaCO2 must be between 10 and 118 mmHg/).waitFor();
      expect(await page.getByLabel("PaCO2 (mmHg)").getAttribute("aria-invalid")).toBe("true");
      expect(await page.getByLabel("PaO2 (mmHg)").inputValue()).toBe("50");

      await page.getByLabel("FiO2 (%)", { exact: true }).fill("");
      await page.getByLabel("FiO2 (%)", { exact: true }).focus();
      await page.keyboard.type("40");
      await page.keyboard.press("Tab");
      await page.keyboard.press("Control+A");
      await page.keyboard.type("80");
      await page.keyboard.press("Tab");
      await page.keyboard.press("Control+A");
      await page.keyboard.type("40");
      await page.keyboard.press("Tab");
      await type("12"); // haemoglobin
      await page.keyboard.press("Tab"); // haemoglobin unit
      await page.keyboard.press("Tab");
      await page.keyboard.type("95"); // SpO2
      await page.keyboard.press("Tab"); // SaO2
      await page.keyboard.press("Tab");
      await page.keyboard.type("Inv"); // support: typeahead picks "Invasive ventilation"
      expect(await page.getByLabel("Support").inputValue()).toBe("invasive");
      await page.keyboard.press("Tab");
      await type("10"); // PEEP
      await page.keyboard.press("Enter");

      const range = page.getByTestId("forecast-range");
      await range.waitFor();
      expect(await range.innerText()).toMatch(/PaO2 forecast \d+–\d+ mmHg/);
      // P/F = 80 / 0.4 = 200 mmHg (Horovitz 1974).
      const pf = page.getByTestId("oxygenation-index").filter({ hasText: "P/F ratio" });
      expect(await pf.innerText()).toContain("200 mmHg");
      await page.getByRole("button", { name: "Basis of P/F ratio" }).focus();
      await page.keyboard.press("Enter");
      await page.getByText("P/F = PaO2 / FiO2").waitFor();
      expect(await page.getByRole("note").first().innerText()).toMatch(/decision support/);

      await page.getByLabel("Proposed FiO2 (%)", { exact: true }).fill("60");
      await expect.poll(() => range.innerText()).toMatch(/FiO2 0\.60/);
      // Tablet width: nothing scrolls sideways.
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
        1024,
      );
      await page.screenshot({ path: `${ARTIFACTS}/chart-oxygenation-day.png`, fullPage: true });

      await page.getByRole("radio", { name: "Night theme" }).click();
      expect(await page.evaluate(() => document.documentElement.dataset.theme)).toBe("night");
      await page.screenshot({ path: `${ARTIFACTS}/chart-oxygenation-night.png`, fullPage: true });
    } finally {
      await context.close();
    }
  });

  it("answers a MICU nurse opening a RESP patient's Chart with the 404 page", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    try {
      await signInThroughForm(page, MICU_NURSE);
      await page.waitForURL(`${BASE_URL}/board`);
      const response = await page.goto(`${BASE_URL}/patients/${RESP_PATIENT_ID}`);
      expect(response?.status()).toBe(404);
      await page.getByRole("heading", { name: "Not found" }).waitFor();
      const malformed = await page.goto(`${BASE_URL}/patients/not-a-number`);
      expect(malformed?.status()).toBe(404);
    } finally {
      await context.close();
    }
  });
});
