import { fireEvent, render, screen, waitFor, within } from "@testing-library/react";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import type { recordAdjustmentAction } from "@/lib/adjustments/actions";
import type { sendOrderRequestAction } from "@/lib/order-requests/actions";
import type { OrderRequestView } from "@/lib/order-requests/queries";
import {
  AdjustmentForm,
  adjustmentFormSchema,
  limitWarnings,
} from "@/components/adjustments/AdjustmentForm";
import type { AdjustmentView } from "@/lib/adjustments/service";
import type { Device } from "@/lib/devices";
import type { OrderView } from "@/lib/orders/queries";
import type { BedsideContext } from "@/lib/chart/bedside";
import type { ForecastPairView } from "@/lib/forecast-accuracy/views";

const mocks = vi.hoisted(() => ({
  record: vi.fn<typeof recordAdjustmentAction>(),
  ask: vi.fn<typeof sendOrderRequestAction>(),
  push: vi.fn<(href: string) => void>(),
}));
vi.mock("@/lib/adjustments/actions", () => ({
  recordAdjustmentAction: mocks.record,
}));
vi.mock("@/lib/order-requests/actions", () => ({
  sendOrderRequestAction: mocks.ask,
}));
vi.mock("next/navigation", () => ({
  useRouter: () => ({ push: mocks.push, refresh: vi.fn(), replace: vi.fn(), prefetch: vi.fn() }),
}));

const PATIENT_ID = 4;

function order(device: Device, limits: Partial<OrderView["limits"]> = {}): OrderView {
  return {
    id: 70,
    patientId: PATIENT_ID,
    admissionId: 4,
    unitId: 1,
    status: "active",
    device,
    spo2Band: { lower: 92, upper: 96 },
    pao2Band: null,
    limits: {
      fio2Min: 0.3,
      fio2Max: 0.6,
      peepMin: null,
      peepMax: null,
      flowMin: 30,
      flowMax: 60,
      ...limits,
    },
    initial: { fio2: 0.4, peep: null, flow: 40 },
    stepTableId: null,
    ventilator: null,
    reassessMinutes: 60,
    rationale: "Type 1 failure",
    entryMode: "written",
    enteredBy: { id: 1, name: "Dr Ines Varga" },
    prescriber: { id: 1, name: "Dr Ines Varga" },
    readBackConfirmed: false,
    signedBy: { id: 1, name: "Dr Ines Varga" },
    signedAt: "2026-12-01T10:00:00.000Z",
    signatureMeaning: null,
    cosignedBy: null,
    cosignedAt: null,
    discontinuedBy: null,
    discontinuedAt: null,
    discontinueReason: null,
    supersededBy: null,
    replacedOrderId: null,
    version: 1,
    createdAt: "2026-12-01T10:00:00.000Z",
  };
}

const gas = {
  id: 1,
  sampledAt: "2026-12-01T10:20:00.000Z",
  sampleType: "arterial" as const,
  pao2: 62,
  paco2: 40,
  hb: 12,
  fio2: 0.4,
  fio2Estimated: false,
  peep: null,
  pfRatio: 155,
};

/** An HFNC patient on FiO2 0.40 and 40 L/min, SpO2 89 %, arterial gas PaO2 62 mmHg at FiO2 0.40. */
function hfncContext(overrides: Partial<BedsideContext> = {}): BedsideContext {
  return {
    admission: {
      admissionId: 4,
      patientId: PATIENT_ID,
      bedId: 4,
      unitId: 1,
      altitudeM: 0,
      timeZone: "UTC",
      dischargedAt: null,
    },
    barometricPressure: 760,
    order: order("hfnc"),
    steps: [],
    settings: {
      device: "hfnc",
      fio2: 0.4,
      fio2Estimated: false,
      peep: null,
      flow: 40,
      version: 7,
      updatedAt: "2026-12-01T10:00:00.000Z",
      lastReassessedAt: "2026-12-01T10:00:00.000Z",
    },
    latestReading: {
      id: 1,
      takenAt: "2026-12-01T10:30:00.000Z",
      spo2: 89,
      respiratoryRate: 26,
      device: "hfnc",
      fio2: 0.4,
      fio2Estimated: false,
      flow: 40,
    },
    latestBloodGas: gas,
    latestArterialGas: { ...gas, freshness: { ageMinutes: 20, maxAgeMinutes: 240, fresh: true } },
    forecastUsesGas: true,
    proposal: {
      direction: "up",
      urgent: false,
      stepsMoved: 1,
      stoppedBy: null,
      step: { fio2: 0.5, flow: 50, stepIndex: 2 },
      forecast: null,
      reason:
        "SpO2 89 % is below the target band 92–96 %: next step up is FiO2 0.5, flow 50 L/min (step 3 of 5).",
      caveats: [],
    },
    proposalError: null,
    ...overrides,
  };
}

function renderForm(
  context: BedsideContext = hfncContext(),
  forecastPairs?: readonly ForecastPairView[],
  canRequest = false,
) {
  return render(
    <AdjustmentForm
      patientId={PATIENT_ID}
      initialContext={context}
      pressureUnit="mmHg"
      timeZone="UTC"
      canRequest={canRequest}
      {...(forecastPairs ? { forecastPairs } : {})}
    />,
  );
}

/** A checked forecast whose three models all erred by `error` mmHg (forecast − measured) against 80. */
function checked(id: number, error: number): ForecastPairView {
  const model = { predicted: 80 + error, measured: 80, error, absoluteError: Math.abs(error) };
  return {
    adjustmentId: id,
    gasId: 100 + id,
    device: "hfnc",
    appliedAt: "2026-12-01T06:00:00.000Z",
    sampledAt: "2026-12-01T06:40:00.000Z",
    minutesAfter: 40,
    fromFio2: 0.35,
    toFio2: 0.4,
    fio2Step: 0.05,
    peepChanged: false,
    measured: 80,
    range: { low: 80 + error, high: 80 + error },
    inRange: error === 0,
    models: { pf: model, alveolarArterialRatio: model, shunt: model },
  };
}

const input = (label: string) => screen.getByLabelText(label) as HTMLInputElement;
const type = (label: string, value: string) =>
  fireEvent.change(input(label), { target: { value } });
const submit = () => fireEvent.click(screen.getByRole("button", { name: "Record adjustment" }));

const recorded: AdjustmentView = {
  id: 9,
  patientId: PATIENT_ID,
  orderId: 70,
  from: { fio2: 0.4, peep: null, flow: 40 },
  to: { fio2: 0.5, peep: null, flow: 40 },
  reason: "below_band",
  rationale: "SpO2 89 %",
  appliedAt: "2026-12-01T10:40:00.000Z",
  forecast: null,
  engineVersion: "1.0.0",
  settingsVersion: 8,
};

beforeEach(() => {
  mocks.record.mockReset();
  mocks.ask.mockReset();
  mocks.push.mockReset();
});
afterEach(() => {
  vi.unstubAllGlobals();
});

describe("AdjustmentForm", () => {
  it("shows the order, the applied settings and the proposal, and fills the form from the proposed step", () => {
    renderForm();
    expect(screen.getByTestId("context-order").textContent).toMatch(/FiO2 limits0\.30–0\.60/);
    expect(screen.getByTestId("context-settings").textContent).toMatch(/FiO20\.40/);
    expect(screen.getByTestId("proposal").textContent).toContain("Step up");
    expect(input("New FiO2").value).toBe("0.4");

    fireEvent.click(screen.getByRole("button", { name: "Use proposed step" }));
    expect(input("New FiO2").value).toBe("0.5");
    expect(input("New flow (L/min)").value).toBe("50");
    expect((screen.getByLabelText("Reason") as HTMLSelectElement).value).toBe("below_band");
  });

  it("forecasts the FiO2 being typed as a range across the three models, with its basis", () => {
    renderForm();
    type("New FiO2", "0.5");
    const text = screen.getByTestId("forecast-range").textContent ?? "";
    const [, low, high] = /PaO2 forecast (\d+)–(\d+) mmHg/.exec(text) ?? [];
    // Constant P/F, one of the three models: 62 / 0.40 × 0.50 = 77.5 mmHg.
    expect(Number(low)).toBeLessThanOrEqual(77.5);
    expect(Number(high)).toBeGreaterThanOrEqual(77.5);
    expect(text).toContain("at FiO2 0.50");
    expect(screen.getByRole("button", { name: "Basis of Forecast range" })).toBeTruthy();
    expect(
      within(screen.getByRole("list", { name: "Forecast by model" })).getAllByRole("listitem"),
    ).toHaveLength(3);
    expect(screen.getByRole("note").textContent).toMatch(/decision support/);
    expect(screen.queryByTestId("peep-note")).toBeNull();
  });

  it("beside the range, widens it by the patient's own errors once three forecasts are checked", () => {
    // Every model erred by −20, 0 and +20 mmHg: each model's interval is P − 20 … P + 20, so
    // the interval is the models' range widened by 20 mmHg at each end.
    renderForm(hfncContext(), [checked(1, -20), checked(2, 0), checked(3, 20)]);
    type("New FiO2", "0.5");
    const range = screen.getByTestId("forecast-range").textContent ?? "";
    const [, low, high] = /PaO2 forecast (\d+)–(\d+) mmHg/.exec(range) ?? [];
    const box = screen.getByTestId("empirical-interval");
    expect(box.textContent).toContain("Empirical interval (3 pairs)");
    expect(box.textContent).toContain(`PaO2 ${Number(low) - 20}–${Number(high) + 20} mmHg`);
  });

  it("says how many checked forecasts the widened range still needs", () => {
    renderForm(hfncContext(), [checked(1, 5)]);
    type("New FiO2", "0.5");
    expect(screen.queryByTestId("empirical-interval")).toBeNull();
    expect(screen.getByTestId("empirical-interval-pending").textContent).toContain(
      "1 of 3 checked forecasts needed before the range widens.",
    );
  });

  it("says there is no numeric forecast without an arterial gas", () => {
    renderForm(
      hfncContext({ latestBloodGas: null, latestArterialGas: null, forecastUsesGas: false }),
    );
    expect(screen.getByTestId("forecast-range").textContent).toMatch(
      /No arterial blood gas on record/,
    );
  });

  it("does not forecast from a gas older than the limit unless chosen, and sends the choice", async () => {
    const stale = { ...gas, sampledAt: "2026-12-01T04:00:00.000Z" };
    const context = hfncContext({
      latestBloodGas: stale,
      latestArterialGas: {
        ...stale,
        freshness: { ageMinutes: 390, maxAgeMinutes: 240, fresh: false },
      },
      forecastUsesGas: false,
    });
    const fetchMock = vi.fn<typeof fetch>(() =>
      Promise.resolve(
        new Response(JSON.stringify({ ...context, forecastUsesGas: true }), { status: 200 }),
      ),
    );
    vi.stubGlobal("fetch", fetchMock);
    mocks.record.mockResolvedValue({ ok: true, data: recorded });
    renderForm(context);
    type("New FiO2", "0.5");
    expect(screen.getByTestId("forecast-range").textContent).toMatch(
      /latest arterial blood gas is 6 h 30 min old, older than the 4 h limit, so there is no numeric forecast/,
    );
    expect(
      screen.getByText(/not used for the forecast \(choose it to forecast from it anyway\)/),
    ).toBeTruthy();

    fireEvent.click(within(screen.getByTestId("use-stale-gas")).getByRole("checkbox"));
    expect(screen.getByTestId("forecast-range").textContent).toMatch(/PaO2 forecast \d+–\d+ mmHg/);
    expect(screen.getByText(/used because a clinician chose it/)).toBeTruthy();
    // The proposal is asked for again with the same choice.
    await waitFor(() =>
      expect(fetchMock).toHaveBeenCalledWith(
        `/api/v1/patients/${PATIENT_ID}/bedside?useStaleBloodGas=1`,
        expect.anything(),
      ),
    );
    type("Rationale", "SpO2 89 %");
    submit();
    await waitFor(() => expect(mocks.record).toHaveBeenCalledTimes(1));
    expect(mocks.record.mock.calls[0]?.[0]).toMatchObject({ useStaleBloodGas: true });
  });

  it("puts an urgent proposal's call to the prescriber first, with the limit that stops it", () => {
    renderForm(
      hfncContext({
        proposal: {
          direction: "up",
          urgent: true,
          stepsMoved: 2,
          stoppedBy: "the order's FiO2 maximum 0.6",
          step: { fio2: 0.6, flow: 60, stepIndex: 3 },
          forecast: null,
          reason:
            "SpO2 70 % is below 85 %, below the target band 92–96 % (urgent): call the prescriber now.",
          caveats: [],
        },
      }),
    );
    const urgent = screen.getByTestId("proposal-urgent").textContent ?? "";
    expect(urgent).toContain("call the prescriber now");
    expect(urgent).toContain("the step stops at the order's FiO2 maximum 0.6");
    expect(screen.getByTestId("proposal").textContent).toContain("(2 table settings)");
  });

  it("warns while typing a value outside the order's limits, and not inside them", () => {
    renderForm();
    type("New FiO2", "0.7");
    expect(screen.getByTestId("limit-warning").textContent).toBe(
      "FiO2 0.70 is above this order's maximum of 0.60 — ask the physician for a new order.",
    );
    expect(input("New FiO2").getAttribute("aria-describedby")).toContain("warning");
    type("New FiO2", "0.45");
    expect(screen.queryByTestId("limit-warning")).toBeNull();
    type("New flow (L/min)", "65");
    expect(screen.getByTestId("limit-warning").textContent).toBe(
      "Flow 65 L/min is above this order's maximum of 60 L/min — ask the physician for a new order.",
    );
  });

  it("refuses an empty rationale and an unchanged setting before sending anything", async () => {
    renderForm();
    type("Reason", "below_band");
    submit();
    await screen.findByText("Rationale is required (3 to 1000 characters).");
    expect(
      screen.getByText(/These are the settings in effect now: change at least one value/),
    ).toBeTruthy();
    expect(mocks.record).not.toHaveBeenCalled();
  });

  it("sends the settings version and an idempotency key, then opens the Chart", async () => {
    mocks.record.mockResolvedValue({ ok: true, data: recorded });
    renderForm();
    type("New FiO2", "0.5");
    type("Rationale", "SpO2 89 % on 0.40");
    submit();
    await waitFor(() => expect(mocks.push).toHaveBeenCalledWith(`/patients/${PATIENT_ID}`));
    expect(mocks.record).toHaveBeenCalledTimes(1);
    const sent = mocks.record.mock.calls[0]?.[0] as Record<string, unknown>;
    expect(sent).toMatchObject({
      patientId: PATIENT_ID,
      settingsVersion: 7,
      toFio2: 0.5,
      toFlow: 40,
      reason: "below_band",
      rationale: "SpO2 89 % on 0.40",
    });
    expect(sent).not.toHaveProperty("toPeep");
    expect(String(sent.idempotencyKey)).toMatch(/^[A-Za-z0-9-]{8,64}$/);
    expect(Date.now() - Date.parse(String(sent.appliedAt))).toBeLessThan(2 * 60_000);
  });

  it("shows the server's refusal beside the field and keeps what was typed", async () => {
    mocks.record.mockResolvedValue({
      ok: false,
      status: 400,
      message:
        "This change is outside the order's limits. To go beyond it, ask the physician for a new order.",
      fieldErrors: {
        toFio2: [
          "FiO2 0.70 is above this order's maximum of 0.60. To go beyond it, ask the physician for a new order.",
        ],
      },
    });
    renderForm();
    type("New FiO2", "0.7");
    type("Rationale", "Desaturating");
    submit();
    await screen.findByText(
      "FiO2 0.70 is above this order's maximum of 0.60. To go beyond it, ask the physician for a new order.",
    );
    expect(input("New FiO2").getAttribute("aria-invalid")).toBe("true");
    expect(input("New FiO2").value).toBe("0.7");
    expect(input("Rationale").value).toBe("Desaturating");
    expect(mocks.push).not.toHaveBeenCalled();
  });

  it("on a conflict reloads the current settings on request, keeps the typed values and resends the same key", async () => {
    mocks.record.mockResolvedValueOnce({
      ok: false,
      status: 409,
      message:
        "The settings were changed by someone else a moment ago (now FiO2 0.45, flow 40 L/min).",
    });
    const fresh = hfncContext();
    fresh.settings = { ...fresh.settings!, fio2: 0.45, version: 8 };
    const fetchMock = vi.fn<typeof fetch>(() =>
      Promise.resolve(new Response(JSON.stringify(fresh), { status: 200 })),
    );
    vi.stubGlobal("fetch", fetchMock);
    renderForm();
    type("New FiO2", "0.5");
    type("Rationale", "SpO2 89 %");
    submit();
    await screen.findByText(/changed by someone else/);
    fireEvent.click(screen.getByRole("button", { name: "Reload current settings" }));
    await waitFor(() =>
      expect(screen.getByTestId("context-settings").textContent).toMatch(/FiO20\.45/),
    );
    expect(fetchMock).toHaveBeenCalledWith(
      `/api/v1/patients/${PATIENT_ID}/bedside`,
      expect.anything(),
    );
    expect(input("New FiO2").value).toBe("0.5");
    expect(input("Rationale").value).toBe("SpO2 89 %");

    mocks.record.mockResolvedValueOnce({ ok: true, data: recorded });
    submit();
    await waitFor(() => expect(mocks.record).toHaveBeenCalledTimes(2));
    const [first, second] = mocks.record.mock.calls.map((c) => c[0] as Record<string, unknown>);
    expect(first?.settingsVersion).toBe(7);
    expect(second?.settingsVersion).toBe(8);
    expect(second?.idempotencyKey).toBe(first?.idempotencyKey);
  });

  it("on a low-flow device takes the flow and shows the FiO2 as an estimate", async () => {
    mocks.record.mockResolvedValue({ ok: true, data: recorded });
    renderForm(
      hfncContext({
        order: order("nasal_cannula", { fio2Min: 0.24, fio2Max: 0.4, flowMin: 1, flowMax: 4 }),
        settings: {
          ...hfncContext().settings!,
          device: "nasal_cannula",
          fio2: 0.25,
          fio2Estimated: true,
          flow: 1,
        },
        proposal: null,
      }),
    );
    expect(screen.queryByLabelText("New FiO2")).toBeNull();
    type("New flow (L/min)", "2");
    // Nasal cannula rule of thumb: 0.21 + 0.04 per L/min.
    expect(screen.getByTestId("estimated-fio2").textContent).toBe("≈ 0.29 (estimate)");
    type("Reason", "below_band");
    type("Rationale", "SpO2 90 % on 1 L/min");
    submit();
    await waitFor(() => expect(mocks.record).toHaveBeenCalledTimes(1));
    expect(mocks.record.mock.calls[0]?.[0]).toMatchObject({ toFio2: 0.29, toFlow: 2 });
  });

  it("says PEEP changes are not forecast numerically when PEEP changes", () => {
    renderForm(
      hfncContext({
        order: order("invasive", { peepMin: 5, peepMax: 14, flowMin: null, flowMax: null }),
        settings: { ...hfncContext().settings!, device: "invasive", peep: 8, flow: null },
      }),
    );
    expect(screen.queryByTestId("peep-note")).toBeNull();
    type("New PEEP (cmH2O)", "10");
    expect(screen.getByTestId("peep-note").textContent).toBe(
      "PEEP changes are not forecast numerically: re-measure (blood gas or SpO2) after changing PEEP.",
    );
  });
});

describe("adjustmentFormSchema and limitWarnings", () => {
  it("require the settings the device uses, in the shared schema's words", () => {
    const parsed = adjustmentFormSchema("invasive", null).safeParse({
      toFio2: "",
      reason: "",
      rationale: "",
      appliedAt: "2026-12-01T10:00",
    });
    expect(parsed.success).toBe(false);
    const messages = Object.fromEntries(
      parsed.error?.issues.map((i) => [i.path.join("."), i.message]) ?? [],
    );
    expect(messages).toMatchObject({
      toFio2: "New FiO2 must be a number between 0.21 and 1.00.",
      toPeep: "New PEEP is required for this device.",
      reason: "Choose a reason from the list.",
      rationale: "Rationale is required (3 to 1000 characters).",
    });
  });

  it("warn below the minimum too, naming an estimated FiO2 as such", () => {
    expect(
      limitWarnings(order("nasal_cannula", { fio2Min: 0.3 }), { fio2: 0.25 }, true).toFio2,
    ).toBe(
      "Estimated FiO2 0.25 is below this order's minimum of 0.30 — ask the physician for a new order.",
    );
    expect(limitWarnings(order("hfnc"), { fio2: 40 }, false).toFio2).toMatch(/FiO2 is a fraction/);
  });
});

describe("asking for a new order from a refused change", () => {
  it("offers the request, prefilled from the value over the limit, and sends it in one click", async () => {
    mocks.ask.mockResolvedValue({
      ok: true,
      data: {
        id: 12,
        told: [[{ name: "Dr Ines Varga", basis: "assigned" }]],
      } as unknown as OrderRequestView,
    });
    renderForm(hfncContext(), undefined, true);
    expect(screen.queryByRole("form", { name: "Ask for a new order" })).toBeNull();
    type("New FiO2", "0.7");
    const ask = await screen.findByRole("form", { name: "Ask for a new order" });
    expect((within(ask).getByLabelText("What is needed") as HTMLInputElement).value).toBe(
      "New limits: FiO2 up to 0.70 (order maximum 0.60)",
    );
    expect((within(ask).getByLabelText("Why") as HTMLTextAreaElement).value).toBe(
      "Latest SpO2 89 % (target 92–96 %) on High-flow nasal cannula: the change needed is outside the order's limits.",
    );
    fireEvent.click(within(ask).getByRole("button", { name: "Send the request" }));
    await screen.findByText(/Request #12 sent to Dr Ines Varga \(responsible physician\)/);
    expect(mocks.ask).toHaveBeenCalledTimes(1);
    expect(mocks.ask.mock.calls[0]![0]).toMatchObject({
      patientId: PATIENT_ID,
      source: "limit_refusal",
      device: "hfnc",
      fio2Max: 0.7,
    });
    // Nothing was recorded: the change itself stays refused.
    expect(mocks.record).not.toHaveBeenCalled();
  });

  it("is not offered to someone who may not ask", () => {
    renderForm(hfncContext(), undefined, false);
    type("New FiO2", "0.7");
    expect(screen.queryByRole("form", { name: "Ask for a new order" })).toBeNull();
  });

  it("is not offered for a value within the limits", () => {
    renderForm(hfncContext(), undefined, true);
    type("New FiO2", "0.5");
    expect(screen.queryByRole("form", { name: "Ask for a new order" })).toBeNull();
  });
});
