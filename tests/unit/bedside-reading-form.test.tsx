import { fireEvent, render, screen, waitFor } from "@testing-library/react";
import { beforeEach, describe, expect, it, vi } from "vitest";
import type { chartReadingAction } from "@/lib/readings/actions";
import { fromZonedLocalInput, toZonedLocalInput } from "@/components/bedside/BedsideFormParts";
import { ReadingForm } from "@/components/readings/ReadingForm";
import type { BedsideContext } from "@/lib/chart/bedside";
import type { ReadingView } from "@/lib/readings/service";

const mocks = vi.hoisted(() => ({
  chart: vi.fn<typeof chartReadingAction>(),
  push: vi.fn<(href: string) => void>(),
}));
vi.mock("@/lib/readings/actions", () => ({
  chartReadingAction: mocks.chart,
}));
vi.mock("next/navigation", () => ({
  useRouter: () => ({ push: mocks.push, refresh: vi.fn(), replace: vi.fn(), prefetch: vi.fn() }),
}));

const PATIENT_ID = 5;

function context(): BedsideContext {
  return {
    admission: {
      admissionId: 5,
      patientId: PATIENT_ID,
      bedId: 5,
      unitId: 1,
      altitudeM: 0,
      timeZone: "UTC",
      dischargedAt: null,
    },
    barometricPressure: 760,
    order: null,
    steps: [],
    settings: {
      device: "hfnc",
      fio2: 0.4,
      fio2Estimated: false,
      peep: null,
      flow: 40,
      version: 3,
      updatedAt: "2026-12-01T10:00:00.000Z",
      lastReassessedAt: "2026-12-01T10:00:00.000Z",
    },
    latestReading: null,
    latestBloodGas: null,
    latestArterialGas: null,
    forecastUsesGas: false,
    proposal: null,
    proposalError: null,
  };
}

const field = (label: string) => screen.getByLabelText(label) as HTMLInputElement;
const type = (label: string, value: string) =>
  fireEvent.change(field(label), { target: { value } });

const charted: ReadingView = {
  id: 1,
  patientId: PATIENT_ID,
  takenAt: "2026-12-01T10:00:00.000Z",
  spo2: 93,
  respiratoryRate: 22,
  pulseRate: null,
  device: "nasal_cannula",
  flow: 2,
  fio2: 0.29,
  fio2Estimated: true,
  source: "manual",
};

beforeEach(() => {
  mocks.chart.mockReset();
  mocks.push.mockReset();
});

describe("ReadingForm", () => {
  it("starts from the applied device and oxygen, and marks a low-flow FiO2 as estimated", () => {
    render(<ReadingForm patientId={PATIENT_ID} context={context()} timeZone="UTC" />);
    expect(field("Device").value).toBe("hfnc");
    expect(field("Flow (L/min)").value).toBe("40");
    expect(field("FiO2").value).toBe("0.4");

    type("Device", "nasal_cannula");
    expect(screen.queryByLabelText("FiO2")).toBeNull();
    expect(field("Flow (L/min)").value).toBe("");
    type("Flow (L/min)", "2");
    // Nasal cannula rule of thumb: 0.21 + 0.04 per L/min.
    expect(screen.getByTestId("estimated-fio2").textContent).toBe("≈ 0.29 (estimate)");
    expect(screen.getByText("FiO2 (estimated)")).toBeTruthy();
  });

  it("refuses an SpO2 outside 0–100 % beside the field, keeping the rate typed", async () => {
    render(<ReadingForm patientId={PATIENT_ID} context={context()} timeZone="UTC" />);
    type("SpO2 (%)", "130");
    type("Respiratory rate (/min)", "22");
    fireEvent.click(screen.getByRole("button", { name: "Chart SpO2" }));
    await screen.findByText("SpO2 must be between 0 and 100 %.");
    expect(field("Respiratory rate (/min)").value).toBe("22");
    expect(mocks.chart).not.toHaveBeenCalled();
  });

  it("charts a deep desaturation (45 %), marked as below oximeter accuracy, never refused", async () => {
    mocks.chart.mockResolvedValue({ ok: true, data: { ...charted, spo2: 45 } });
    render(<ReadingForm patientId={PATIENT_ID} context={context()} timeZone="UTC" />);
    type("SpO2 (%)", "45");
    expect(screen.getByText(/below oximeter accuracy: charted and alerted/)).toBeTruthy();
    type("SpO2 (%)", "93");
    expect(screen.queryByText(/below oximeter accuracy/)).toBeNull();
    type("SpO2 (%)", "45");
    type("Respiratory rate (/min)", "30");
    fireEvent.click(screen.getByRole("button", { name: "Chart SpO2" }));
    await waitFor(() => expect(mocks.chart).toHaveBeenCalledTimes(1));
    expect(mocks.chart.mock.calls[0]?.[0]).toMatchObject({ spo2: 45 });
  });

  it("charts the reading with the device's own settings only, then opens the Chart", async () => {
    mocks.chart.mockResolvedValue({ ok: true, data: charted });
    render(<ReadingForm patientId={PATIENT_ID} context={context()} timeZone="UTC" />);
    type("SpO2 (%)", "93");
    type("Respiratory rate (/min)", "22");
    type("Device", "nasal_cannula");
    type("Flow (L/min)", "2");
    fireEvent.click(screen.getByRole("button", { name: "Chart SpO2" }));
    await waitFor(() => expect(mocks.push).toHaveBeenCalledWith(`/patients/${PATIENT_ID}`));
    const sent = mocks.chart.mock.calls[0]?.[0] as Record<string, unknown>;
    expect(sent).toMatchObject({
      patientId: PATIENT_ID,
      spo2: 93,
      respiratoryRate: 22,
      device: "nasal_cannula",
      flow: 2,
    });
    expect(sent).not.toHaveProperty("fio2");
    expect(String(sent.idempotencyKey)).toMatch(/^[A-Za-z0-9-]{8,64}$/);
  });
});

describe("the unit's wall-clock time", () => {
  it("round-trips an instant through a datetime-local value in the unit's zone", () => {
    const instant = new Date("2026-07-01T10:30:00Z");
    expect(toZonedLocalInput(instant, "UTC")).toBe("2026-07-01T10:30");
    // Central European Summer Time is UTC+2.
    expect(toZonedLocalInput(instant, "Europe/Berlin")).toBe("2026-07-01T12:30");
    expect(fromZonedLocalInput("2026-07-01T12:30", "Europe/Berlin")?.toISOString()).toBe(
      "2026-07-01T10:30:00.000Z",
    );
    expect(fromZonedLocalInput("2026-01-15T12:30", "Europe/Berlin")?.toISOString()).toBe(
      "2026-01-15T11:30:00.000Z",
    );
    expect(fromZonedLocalInput("not a time", "UTC")).toBeNull();
  });
});
