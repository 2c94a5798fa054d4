import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { hashPassword } from "@/lib/auth/password";
import type { OrderRequestView } from "@/lib/order-requests/queries";
import {
  ARTIFACTS,
  BASE_URL,
  DEMO_PASSWORD,
  launchBrowser,
  signInThroughForm,
} from "../helpers/browser";
import { admitTestPatient, appDb, uniqueEmail } from "../helpers/db";
import { Session } from "../helpers/http";

// The request loop in the built app: a therapist refused at the order's limit
// asks for a new order in one step; the shift's physician opens it from the
// Board, writes the order prefilled from it and signs; the therapist sees the
// request closed. Fresh staff and a fresh bed, so nothing seeded interferes.

const TIMEOUT = 150_000;
let browser: Browser;

async function person(role: "therapist" | "physician"): Promise<{ id: number; email: string }> {
  const email = uniqueEmail(`e2e-loops-${role}`);
  const [id] = await appDb()("users").insert({
    email,
    name: role === "physician" ? "Dr Loops Physician" : "Loops Therapist",
    role,
    password_hash: await hashPassword(DEMO_PASSWORD),
  });
  const unit = (await appDb()("units").where({ code: "MICU" }).first("id")) as { id: number };
  await appDb()("user_units").insert({ user_id: Number(id), unit_id: unit.id });
  return { id: Number(id), email };
}

async function signedInPage(email: string): Promise<Page> {
  const page = await (await browser.newContext()).newPage();
  await signInThroughForm(page, email);
  await page.waitForURL(`${BASE_URL}/board`);
  return page;
}

const typeInto = async (page: Page, label: string, text: string) => {
  await page.getByLabel(label, { exact: true }).focus();
  await page.keyboard.press("Control+A");
  await page.keyboard.type(text);
};

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser.close();
});

describe("a request for a new order, end to end", () => {
  it(
    "goes from the refused change to the physician's prefilled, signed order and reads closed",
    async () => {
      const [therapist, physician] = await Promise.all([person("therapist"), person("physician")]);
      const { patientId, bedId } = await admitTestPatient("MICU");
      const now = Date.now();
      await appDb()("care_assignments").insert(
        (
          [
            ["therapist", therapist.id],
            ["physician", physician.id],
          ] as const
        ).map(([duty, userId]) => ({
          bed_id: bedId,
          user_id: userId,
          duty,
          starts_at: new Date(now - 3600_000),
          ends_at: new Date(now + 10 * 3600_000),
        })),
      );
      const api = await Session.signIn(physician.email);
      const written = await api.json("/api/v1/orders", "POST", {
        entryMode: "written",
        password: DEMO_PASSWORD,
        patientId,
        device: "hfnc",
        spo2Lower: 92,
        spo2Upper: 96,
        fio2Min: 0.3,
        fio2Max: 0.6,
        flowMin: 30,
        flowMax: 60,
        initialFio2: 0.6,
        initialFlow: 50,
        reassessMinutes: 60,
        rationale: "Hypoxaemic on high flow (loops e2e)",
        supersedesOrderId: null,
      });
      expect(written.status, await written.clone().text()).toBe(201);

      // The therapist types a change beyond the order's FiO2 maximum.
      const bedside = await signedInPage(therapist.email);
      await bedside.goto(`${BASE_URL}/patients/${patientId}/adjustments/new`);
      await bedside.locator("form[data-ready]").waitFor();
      await typeInto(bedside, "New FiO2", "0.7");
      const ask = bedside.getByRole("form", { name: "Ask for a new order" });
      await ask.waitFor();
      expect(await ask.getByLabel("What is needed").inputValue()).toBe(
        "New limits: FiO2 up to 0.70 (order maximum 0.60)",
      );
      expect(await ask.getByLabel("Proposed FiO2 maximum").inputValue()).toBe("0.7");
      // One step: the request is prefilled, one button sends it.
      await ask.getByRole("button", { name: "Send the request" }).click();
      const sent = bedside.getByRole("status").filter({ hasText: /Request #\d+ sent/ });
      await sent.waitFor();
      expect(await sent.innerText()).toContain("Dr Loops Physician (responsible physician)");
      const requestId = Number(/#(\d+)/.exec(await sent.innerText())![1]);

      // The physician finds it on the Board and writes the order from it.
      const desk = await signedInPage(physician.email);
      const waiting = desk.getByTestId("waiting-requests");
      await waiting.getByRole("link", { name: new RegExp(`#${requestId}`) }).click();
      await desk.waitForURL(/\/order-requests\?request=/);
      const card = desk.locator(`#request-${requestId}`);
      expect(await card.innerText()).toMatch(/latest SpO2|no SpO2 charted/);
      await card.getByRole("link", { name: "Write the order from this request" }).click();
      await desk.waitForURL(/\/orders\/new\?request=/);
      await desk.getByText(`Started from order request #${requestId}`).waitFor();
      expect(await desk.getByLabel("FiO2 maximum", { exact: true }).inputValue()).toBe("0.70");
      expect(await desk.getByLabel("Rationale").inputValue()).toContain(
        `Order request #${requestId} from Loops Therapist`,
      );
      await typeInto(desk, "Password to sign", DEMO_PASSWORD);
      await desk.keyboard.press("Enter");
      await desk.waitForURL(`${BASE_URL}/patients/${patientId}`);

      // The therapist sees it closed by that order.
      await bedside.goto(`${BASE_URL}/order-requests?request=${requestId}`);
      const closed = bedside.locator(`#request-${requestId}`).getByTestId("request-closed");
      await closed.waitFor();
      expect(await closed.innerText()).toMatch(
        /closed by order #\d+, signed by Dr Loops Physician/,
      );
      const res = await api.fetch(`/api/v1/order-requests?status=all&requestId=${requestId}`);
      const [request] = ((await res.json()) as { requests: OrderRequestView[] }).requests;
      expect(request).toMatchObject({ state: "closed", closedHow: "order" });

      // The queue at a phone's width: nothing scrolls sideways.
      await bedside.setViewportSize({ width: 390, height: 844 });
      await bedside.reload();
      await bedside.locator(`#request-${requestId}`).waitFor();
      expect(
        await bedside.evaluate(() => document.documentElement.scrollWidth),
      ).toBeLessThanOrEqual(390);
      await bedside.screenshot({ path: `${ARTIFACTS}/order-requests-390.png`, fullPage: true });
      await bedside.getByRole("radio", { name: "Night theme" }).click();
      await bedside.screenshot({
        path: `${ARTIFACTS}/order-requests-390-night.png`,
        fullPage: true,
      });
      await bedside.getByRole("radio", { name: "Day theme" }).click();
    },
    TIMEOUT,
  );
});
