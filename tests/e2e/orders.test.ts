import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { OrderView } from "@/lib/orders/queries";
import {
  ARTIFACTS,
  BASE_URL,
  DEMO_PASSWORD,
  launchBrowser,
  signInThroughForm,
} from "../helpers/browser";
import { Session } from "../helpers/http";

const PHYSICIAN = "ines.varga@kestrel.example"; // Dr Ines Varga, MICU and RESP
const PHYSICIAN_ID = 1;
const NURSE = "hana.whitlock@kestrel.example"; // MICU
const REVIEWER = "edith.calloway@kestrel.example";

// Other test files write orders on seeded patients too; these four are this file's own.
const PATIENT_WRITTEN = 7; // MICU: a physician's signed order, by keyboard
const PATIENT_VERBAL = 8; // MICU: a nurse's telephone order, co-signed
const PATIENT_CONFLICT = 20; // RESP: two writers, one order in effect
const PATIENT_API = 21; // RESP: refusals over the API

type ApiErrorBody = { error: { message: string; fieldErrors?: Record<string, string[]> } };

/** The order in effect now, read the way any client reads it. */
async function currentOrder(session: Session, patientId: number): Promise<OrderView | null> {
  const res = await session.fetch(`/api/v1/patients/${patientId}/bedside`);
  expect(res.status).toBe(200);
  return ((await res.json()) as { order: OrderView | null }).order;
}

function venturiOrder(patientId: number, supersedesOrderId: number | null, rationale: string) {
  return {
    patientId,
    device: "venturi_mask",
    spo2Lower: 88,
    spo2Upper: 92,
    fio2Min: 0.24,
    fio2Max: 0.4,
    initialFio2: 0.28,
    reassessMinutes: 60,
    rationale,
    supersedesOrderId,
  };
}

/** Keyboard only: focus the labelled field, select what is there, type. */
async function typeInto(page: Page, label: string | RegExp, text: string): Promise<void> {
  await page.getByLabel(label, { exact: typeof label === "string" }).focus();
  await page.keyboard.press("Control+A");
  await page.keyboard.type(text);
}

// Browser stories type a whole order by keyboard; a cold server compiles pages on first use.
const STORY_TIMEOUT = 150_000;

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("the order composer", () => {
  it(
    "lets a physician write and sign an order by keyboard; refusals stay beside the fields with the values kept",
    async () => {
      const api = await Session.signIn(PHYSICIAN);
      const before = await currentOrder(api, PATIENT_WRITTEN);
      const rationale = `Keyboard-signed nasal cannula order ${Date.now()}`;
      const context = await browser.newContext({ viewport: { width: 1024, height: 768 } });
      const page = await context.newPage();
      try {
        await signInThroughForm(page, PHYSICIAN);
        await page.waitForURL(`${BASE_URL}/board`);
        await page.goto(`${BASE_URL}/patients/${PATIENT_WRITTEN}/orders/new`);
        await page.getByRole("heading", { level: 1, name: /Oxygen order for/ }).waitFor();
        const inEffect = page.getByTestId("order-in-effect");
        if (before) expect(await inEffect.innerText()).toContain(`Order #${before.id}`);
        else expect(await inEffect.innerText()).toContain("No order in effect");

        // Choosing a device by typeahead shows only the limits it uses.
        await page.getByLabel("Delivery device").focus();
        await page.keyboard.type("Nasal");
        expect(await page.getByLabel("Delivery device").inputValue()).toBe("nasal_cannula");
        await page.getByLabel("Flow minimum (L/min)").waitFor();
        expect(await page.getByLabel("PEEP minimum (cmH2O)").count()).toBe(0);

        await typeInto(page, "FiO2 minimum", "0.24");
        await typeInto(page, "FiO2 maximum", "0.9"); // beyond what a nasal cannula delivers
        await typeInto(page, "Flow minimum (L/min)", "1");
        await typeInto(page, "Flow maximum (L/min)", "4");
        await typeInto(page, "Starting flow (L/min)", "3");
        // The starting FiO2 of a low-flow device follows the flow: 0.21 + 0.04 × 3 L/min.
        expect(await page.getByLabel("Starting FiO2").inputValue()).toBe("0.33");
        await page.getByRole("radio", { name: /94–98 %/ }).focus();
        await page.keyboard.press("Space");
        await page.getByRole("radio", { name: "2 h" }).focus();
        await page.keyboard.press("Space");
        await typeInto(page, "Rationale", rationale);
        await typeInto(page, "Password to sign", DEMO_PASSWORD);
        await page.keyboard.press("Enter");

        // Refused before sending, by the shared schema: beside FiO2 maximum, in words.
        const fio2Max = page.getByLabel("FiO2 maximum");
        await page.getByText("Nasal cannula delivers FiO2 between 0.21 and 0.45.").waitFor();
        expect(await fio2Max.getAttribute("aria-invalid")).toBe("true");
        expect(await fio2Max.inputValue()).toBe("0.9");
        expect(await page.getByLabel("Rationale").inputValue()).toBe(rationale);
        expect(page.url()).toContain("/orders/new");

        // Refused by the server: the wrong password, beside the password field.
        await typeInto(page, "FiO2 maximum", "0.37");
        await typeInto(page, "Password to sign", "not-my-password");
        await page.keyboard.press("Enter");
        await page.getByText("The password does not match your account.").waitFor();
        expect(await page.getByLabel("Password to sign").getAttribute("aria-invalid")).toBe("true");
        expect(await fio2Max.inputValue()).toBe("0.37");
        expect(await page.getByLabel("Flow maximum (L/min)").inputValue()).toBe("4");
        expect(await page.getByLabel("Rationale").inputValue()).toBe(rationale);
        expect(await page.getByRole("radio", { name: "2 h" }).isChecked()).toBe(true);
        expect((await currentOrder(api, PATIENT_WRITTEN))?.id ?? null).toBe(before?.id ?? null);

        expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
          1024,
        );
        await page.evaluate(() => window.scrollTo(0, 0));
        await page.screenshot({ path: `${ARTIFACTS}/order-composer-day.png`, fullPage: true });
        await page.getByRole("radio", { name: "Night theme" }).click();
        expect(await page.evaluate(() => document.documentElement.dataset.theme)).toBe("night");
        await page.screenshot({ path: `${ARTIFACTS}/order-composer-night.png`, fullPage: true });
        await page.getByRole("radio", { name: "Day theme" }).click();

        await typeInto(page, "Password to sign", DEMO_PASSWORD);
        await page.keyboard.press("Enter");
        await page.waitForURL(`${BASE_URL}/patients/${PATIENT_WRITTEN}`);
        const summary = page.getByTestId("bedside-summary");
        await summary.waitFor();
        expect(await summary.innerText()).toContain("Nasal cannula");
        expect(await summary.innerText()).toContain(rationale);

        const after = await currentOrder(api, PATIENT_WRITTEN);
        expect(after).toMatchObject({
          status: "active",
          device: "nasal_cannula",
          entryMode: "written",
          spo2Band: { lower: 94, upper: 98 },
          limits: { fio2Min: 0.24, fio2Max: 0.37, flowMin: 1, flowMax: 4, peepMin: null },
          initial: { fio2: 0.33, flow: 3 },
          reassessMinutes: 120,
          rationale,
          prescriber: { id: PHYSICIAN_ID },
        });
        expect(after?.signedAt).not.toBeNull();
        expect(after?.id).not.toBe(before?.id);
        if (before) {
          const old = await api.fetch(`/api/v1/orders/${before.id}`);
          expect(((await old.json()) as { order: OrderView }).order.status).toBe("superseded");
        }
      } finally {
        await context.close();
      }
    },
    STORY_TIMEOUT,
  );

  it(
    "shows a conflict in words, with a way to reload, when another order was written meanwhile",
    async () => {
      const api = await Session.signIn(PHYSICIAN);
      const context = await browser.newContext({ viewport: { width: 1024, height: 768 } });
      const page = await context.newPage();
      try {
        await signInThroughForm(page, PHYSICIAN);
        await page.waitForURL(`${BASE_URL}/board`);
        await page.goto(`${BASE_URL}/patients/${PATIENT_CONFLICT}/orders/new`);
        await page.getByRole("heading", { level: 1, name: /Oxygen order for/ }).waitFor();

        // Someone else signs an order for the same patient while this form is open.
        const seen = await currentOrder(api, PATIENT_CONFLICT);
        const other = await api.json("/api/v1/orders", "POST", {
          ...venturiOrder(PATIENT_CONFLICT, seen?.id ?? null, "Written meanwhile elsewhere"),
          entryMode: "written",
          password: DEMO_PASSWORD,
        });
        expect(other.status).toBe(201);
        const otherId = ((await other.json()) as { order: OrderView }).order.id;

        // The ward does not ventilate: high flow is the most it allows.
        await page.getByLabel("Delivery device").selectOption("hfnc");
        await typeInto(page, "FiO2 minimum", "0.3");
        await typeInto(page, "FiO2 maximum", "0.8");
        await typeInto(page, "Starting FiO2", "0.5");
        await typeInto(page, "Flow minimum (L/min)", "30");
        await typeInto(page, "Flow maximum (L/min)", "60");
        await typeInto(page, "Starting flow (L/min)", "40");
        await typeInto(page, "Rationale", "High flow for worsening hypoxaemia");
        await typeInto(page, "Password to sign", DEMO_PASSWORD);
        await page.keyboard.press("Enter");

        const alert = page.getByRole("alert").filter({ hasText: "Not saved" });
        await alert.waitFor();
        expect(await alert.innerText()).toContain(`Another order (#${otherId}`);
        expect(
          await alert.getByRole("link", { name: /Reload this page/ }).getAttribute("href"),
        ).toBe(`/patients/${PATIENT_CONFLICT}/orders/new`);
        expect(await page.getByLabel("Rationale").inputValue()).toBe(
          "High flow for worsening hypoxaemia",
        );
        expect((await currentOrder(api, PATIENT_CONFLICT))?.id).toBe(otherId);

        // Refreshing shows the order now in effect and keeps what was typed.
        await alert.getByRole("button", { name: /Show the order now in effect/ }).click();
        await expect
          .poll(() => page.getByTestId("order-in-effect").innerText(), { timeout: 30_000 })
          .toContain(`Order #${otherId}`);
        expect(await page.getByLabel("Rationale").inputValue()).toBe(
          "High flow for worsening hypoxaemia",
        );
      } finally {
        await context.close();
      }
    },
    STORY_TIMEOUT,
  );
});

describe("a verbal order", () => {
  it(
    "is entered by a nurse with read-back, co-signed by the physician from the queue, and its past state stays readable",
    async () => {
      const nurseApi = await Session.signIn(NURSE);
      const before = await currentOrder(nurseApi, PATIENT_VERBAL);
      const rationale = `Telephone order, rising work of breathing ${Date.now()}`;
      const nurseContext = await browser.newContext({ viewport: { width: 1024, height: 768 } });
      const nursePage = await nurseContext.newPage();
      let orderId: number;
      try {
        await signInThroughForm(nursePage, NURSE);
        await nursePage.waitForURL(`${BASE_URL}/board`);
        await nursePage.goto(`${BASE_URL}/patients/${PATIENT_VERBAL}/orders/new`);
        await nursePage
          .getByRole("heading", { level: 1, name: /Verbal or telephone order for/ })
          .waitFor();

        await nursePage.getByLabel("Delivery device").focus();
        await nursePage.keyboard.type("High");
        expect(await nursePage.getByLabel("Delivery device").inputValue()).toBe("hfnc");
        await typeInto(nursePage, "FiO2 minimum", "0.3");
        await typeInto(nursePage, "FiO2 maximum", "0.6");
        await typeInto(nursePage, "Starting FiO2", "0.4");
        await typeInto(nursePage, "Flow minimum (L/min)", "30");
        await typeInto(nursePage, "Flow maximum (L/min)", "60");
        await typeInto(nursePage, "Starting flow (L/min)", "40");
        await nursePage.getByRole("radio", { name: /88–92 %/ }).focus();
        await nursePage.keyboard.press("Space");
        await typeInto(nursePage, "Rationale", rationale);
        await nursePage.getByRole("radio", { name: "Telephone" }).focus();
        await nursePage.keyboard.press("Space");
        await nursePage.getByLabel("Ordering physician", { exact: true }).focus();
        await nursePage.keyboard.type("Dr Ines");
        expect(await nursePage.getByLabel("Ordering physician", { exact: true }).inputValue()).toBe(
          String(PHYSICIAN_ID),
        );
        await nursePage.getByRole("button", { name: "Enter telephone order" }).focus();
        await nursePage.keyboard.press("Enter");

        // Without the read-back the order is refused, beside the checkbox.
        await nursePage
          .getByText("Confirm that you read the order back to the physician.")
          .waitFor();
        const readBack = nursePage.getByLabel(
          /I read the order back to Dr Ines Varga and they confirmed it/,
        );
        expect(await readBack.getAttribute("aria-invalid")).toBe("true");
        expect(await nursePage.getByLabel("Rationale").inputValue()).toBe(rationale);
        await readBack.focus();
        await nursePage.keyboard.press("Space");
        await nursePage.getByRole("button", { name: "Enter telephone order" }).focus();
        await nursePage.keyboard.press("Enter");

        await nursePage.waitForURL(`${BASE_URL}/patients/${PATIENT_VERBAL}`);
        const summary = nursePage.getByTestId("bedside-summary");
        await summary.waitFor();
        expect(await summary.innerText()).toContain("Awaiting co-sign");
        const entered = await currentOrder(nurseApi, PATIENT_VERBAL);
        expect(entered).toMatchObject({
          status: "awaiting_cosign",
          entryMode: "telephone",
          device: "hfnc",
          spo2Band: { lower: 88, upper: 92 },
          prescriber: { id: PHYSICIAN_ID },
          enteredBy: { name: "Hana Whitlock" },
          rationale,
          signedAt: null,
        });
        expect(entered?.id).not.toBe(before?.id);
        orderId = entered!.id;
      } finally {
        await nurseContext.close();
      }

      // A moment after the entry and before the co-signature, on the unit's clock (UTC in the demo).
      // Whole seconds, never :00 (the datetime input would drop it and read differently).
      await sleep(1500);
      let awaitingMoment = new Date(Math.floor(Date.now() / 1000) * 1000);
      if (awaitingMoment.getUTCSeconds() === 0) {
        await sleep(1000);
        awaitingMoment = new Date(Math.floor(Date.now() / 1000) * 1000);
      }
      await sleep(1200);

      const context = await browser.newContext({ viewport: { width: 1024, height: 768 } });
      const page = await context.newPage();
      try {
        await signInThroughForm(page, PHYSICIAN);
        await page.waitForURL(`${BASE_URL}/board`);
        await page.goto(`${BASE_URL}/orders/cosign`);
        await page.getByRole("heading", { level: 1, name: "Co-sign queue" }).waitFor();
        const link = page.getByRole("link", {
          name: `Review and co-sign order #${orderId} for Halla Foxley`,
        });
        const row = page.getByTestId("cosign-row").filter({ has: link });
        const rowText = await row.innerText();
        expect(rowText).toContain("Halla Foxley");
        expect(rowText).toContain("High-flow nasal cannula");
        expect(rowText).toContain("88–92 %");
        expect(rowText).toContain("Hana Whitlock");
        expect(rowText).toMatch(/Telephone from Dr Ines Varga/);
        expect(rowText).toMatch(/\d+ min/);
        // Co-signing is offered only to the prescriber an order names or a designated co-signer: the
        // demo's ward telephone order names Dr Amara Obi-Lund, and Dr Ines Varga is designated nowhere.
        for (const other of await page
          .getByTestId("cosign-row")
          .filter({ hasText: "from Dr Amara Obi-Lund" })
          .all()) {
          expect(await other.getByRole("link", { name: /^Review and co-sign/ }).count()).toBe(0);
          expect(await other.getByRole("link", { name: /^Review order #/ }).count()).toBe(1);
          expect(await other.innerText()).toMatch(
            /Dr Amara Obi-Lund( or a designated co-signer)? co-signs/,
          );
        }
        expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
          1024,
        );
        await page.screenshot({ path: `${ARTIFACTS}/order-cosign-queue-day.png`, fullPage: true });

        await link.focus();
        await page.keyboard.press("Enter");
        await page.waitForURL(`${BASE_URL}/orders/${orderId}`);
        await page.getByRole("heading", { level: 1, name: `Order #${orderId}` }).waitFor();
        expect(await page.getByTestId("order-state").innerText()).toContain("Awaiting co-sign");

        // A wrong password signs nothing.
        await typeInto(page, "Password to co-sign", "not-my-password");
        await page.keyboard.press("Enter");
        await page.getByText("The password does not match your account.").waitFor();
        expect((await currentOrder(nurseApi, PATIENT_VERBAL))?.status).toBe("awaiting_cosign");

        await typeInto(page, "Password to co-sign", DEMO_PASSWORD);
        await page.keyboard.press("Enter");
        // The form leaves with the refresh: the order's state says what happened.
        await expect
          .poll(() => page.getByTestId("order-state").innerText(), { timeout: 30_000 })
          .toContain("Active");
        const signature = page.getByRole("region", { name: "Signature", exact: true });
        expect(await signature.innerText()).toContain("Dr Ines Varga");
        expect(await signature.innerText()).toContain("I am the prescriber of this oxygen order");

        const res = await nurseApi.fetch(`/api/v1/orders/${orderId}`);
        const { order } = (await res.json()) as { order: OrderView };
        expect(order).toMatchObject({ status: "active", cosignedBy: { id: PHYSICIAN_ID } });
        expect(Date.parse(order.cosignedAt!)).toBeGreaterThan(awaitingMoment.getTime());

        // As it stood before the co-signature: awaiting co-sign.
        await page.getByLabel(/Date and time/).fill(awaitingMoment.toISOString().slice(0, 19));
        await page.getByRole("button", { name: "Show the order as it stood" }).click();
        await page.waitForURL(/asOf=/);
        const asOf = page.getByTestId("order-as-of");
        await asOf.waitFor();
        expect(await asOf.innerText()).toContain("Awaiting co-sign");
        expect(await asOf.innerText()).toContain("Not yet");
        expect(await asOf.innerText()).toContain("(now active)");
        expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
          1024,
        );
        await page.screenshot({ path: `${ARTIFACTS}/order-detail-day.png`, fullPage: true });
      } finally {
        await context.close();
      }
    },
    STORY_TIMEOUT,
  );
});

describe("discontinuing an order", () => {
  it(
    "needs a reason and the password, and leaves the patient with no order in effect",
    async () => {
      const api = await Session.signIn(PHYSICIAN);
      const seen = await currentOrder(api, PATIENT_API);
      const written = await api.json("/api/v1/orders", "POST", {
        ...venturiOrder(PATIENT_API, seen?.id ?? null, "Venturi 28 % overnight"),
        entryMode: "written",
        password: DEMO_PASSWORD,
      });
      expect(written.status).toBe(201);
      const orderId = ((await written.json()) as { order: OrderView }).order.id;
      const reason = `Weaned to room air, SpO2 96 % ${Date.now()}`;

      const context = await browser.newContext({ viewport: { width: 1024, height: 768 } });
      const page = await context.newPage();
      try {
        await signInThroughForm(page, PHYSICIAN);
        await page.waitForURL(`${BASE_URL}/board`);
        await page.goto(`${BASE_URL}/orders/${orderId}`);
        await page.getByRole("heading", { level: 1, name: `Order #${orderId}` }).waitFor();
        expect(await page.getByRole("region", { name: "Prescription" }).innerText()).toMatch(
          /Venturi mask[\s\S]*88–92 %[\s\S]*0\.24–0\.40 \(24–40 %\)/,
        );
        await page.getByText("Discontinue this order…").focus();
        await page.keyboard.press("Enter");
        await typeInto(page, "Password to sign", DEMO_PASSWORD);
        await page.keyboard.press("Enter");
        // The reason is required: refused beside it, before anything is sent.
        await page.getByText("Give a reason (5 to 1000 characters).").waitFor();
        expect(await page.getByLabel("Reason").getAttribute("aria-invalid")).toBe("true");
        expect((await currentOrder(api, PATIENT_API))?.id).toBe(orderId);

        await typeInto(page, "Reason", reason);
        await page.getByRole("button", { name: "Discontinue order" }).focus();
        await page.keyboard.press("Enter");
        await expect
          .poll(() => page.getByTestId("order-state").innerText(), { timeout: 30_000 })
          .toContain(`Discontinued by Dr Ines Varga`);
        expect(await page.getByTestId("order-state").innerText()).toContain(reason);
        expect(await page.getByRole("button", { name: "Discontinue order" }).count()).toBe(0);
        expect(await currentOrder(api, PATIENT_API)).toBeNull();
      } finally {
        await context.close();
      }
    },
    STORY_TIMEOUT,
  );
});

describe("who may write an order", () => {
  it(
    "refuses a nurse's signed order with 400 on entryMode, a reviewer's with 403, and shows a reviewer the 403 page",
    async () => {
      const nurse = await Session.signIn(NURSE);
      const physician = await Session.signIn(PHYSICIAN);
      const before = await currentOrder(physician, PATIENT_WRITTEN);
      const written = {
        ...venturiOrder(PATIENT_WRITTEN, before?.id ?? null, "A nurse cannot sign this"),
        entryMode: "written",
        password: DEMO_PASSWORD,
      };
      const refused = await nurse.json("/api/v1/orders", "POST", written);
      expect(refused.status).toBe(400);
      const { error } = (await refused.json()) as ApiErrorBody;
      expect(error.fieldErrors?.entryMode).toEqual([
        "Enter it as a verbal or telephone order from the physician, with read-back.",
      ]);

      const reviewer = await Session.signIn(REVIEWER);
      const forbidden = await reviewer.json("/api/v1/orders", "POST", written);
      expect(forbidden.status).toBe(403);
      expect((await currentOrder(physician, PATIENT_WRITTEN))?.id ?? null).toBe(before?.id ?? null);

      const context = await browser.newContext();
      const page = await context.newPage();
      try {
        await signInThroughForm(page, REVIEWER);
        await page.waitForURL(`${BASE_URL}/reports`);
        const response = await page.goto(`${BASE_URL}/patients/${PATIENT_WRITTEN}/orders/new`);
        expect(response?.status()).toBe(403);
        await page.getByRole("heading", { name: "Not available to your role" }).waitFor();
        expect(await page.getByLabel("Delivery device").count()).toBe(0);
        const queue = await page.goto(`${BASE_URL}/orders/cosign`);
        expect(queue?.status()).toBe(403);
      } finally {
        await context.close();
      }
    },
    STORY_TIMEOUT,
  );

  it(
    "answers a nurse opening another unit's patient, or another unit's order, with the 404 page",
    async () => {
      const physician = await Session.signIn(PHYSICIAN);
      let order = await currentOrder(physician, PATIENT_API);
      if (!order) {
        const res = await physician.json("/api/v1/orders", "POST", {
          ...venturiOrder(PATIENT_API, null, "RESP order for the unit check"),
          entryMode: "written",
          password: DEMO_PASSWORD,
        });
        expect(res.status).toBe(201);
        order = ((await res.json()) as { order: OrderView }).order;
      }
      const context = await browser.newContext();
      const page = await context.newPage();
      try {
        await signInThroughForm(page, NURSE); // MICU only
        await page.waitForURL(`${BASE_URL}/board`);
        const composer = await page.goto(`${BASE_URL}/patients/${PATIENT_API}/orders/new`);
        expect(composer?.status()).toBe(404);
        const detail = await page.goto(`${BASE_URL}/orders/${order.id}`);
        expect(detail?.status()).toBe(404);
        await page.getByRole("heading", { name: "Not found" }).waitFor();
      } finally {
        await context.close();
      }
    },
    STORY_TIMEOUT,
  );
});
