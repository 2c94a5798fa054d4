import { fireEvent, render, screen, waitFor } from "@testing-library/react";
import { beforeEach, describe, expect, it, vi } from "vitest";
import type { recordBloodGasAction } from "@/lib/blood-gases/actions";
import {
  BloodGasForm,
  bloodGasFormSchema,
  bloodGasPayload,
  type BloodGasFormOutput,
} from "@/components/blood-gases/BloodGasForm";
import type { BloodGasInput as BloodGasPayload } from "@/lib/blood-gases/schema";
import type { BloodGasView } from "@/lib/blood-gases/service";
import { assessBloodGas, ENGINE_VERSION } from "@/lib/oxygen";
import type { BedsideContext } from "@/lib/chart/bedside";

const mocks = vi.hoisted(() => ({ record: vi.fn<typeof recordBloodGasAction>() }));
vi.mock("@/lib/blood-gases/actions", () => ({
  recordBloodGasAction: mocks.record,
}));

const PATIENT_ID = 6;
const extra = {
  patientId: PATIENT_ID,
  sampledAt: new Date("2026-12-01T10:00:00Z"),
  idempotencyKey: "key-12345678",
};

const base: BloodGasFormOutput = {
  sampleType: "arterial",
  sampledAt: "2026-12-01T10:00",
  pressureUnit: "kPa",
  hemoglobinUnit: "g/L",
  pao2: 8,
  paco2: 5.3,
  hemoglobin: 120,
  device: "hfnc",
  flow: 40,
  fio2: 0.4,
  peep: 5,
};

describe("bloodGasPayload", () => {
  it("converts kPa to mmHg and g/L or mmol/L to g/dL, to the precision stored", () => {
    const sent = bloodGasPayload(base, extra);
    // 1 kPa = 7.50062 mmHg: 8.0 kPa = 60.005 → 60.0 mmHg; 5.3 kPa = 39.75 → 39.8 mmHg.
    expect(sent.pao2).toBe(60);
    expect(sent.paco2).toBe(39.8);
    // 120 g/L = 12 g/dL.
    expect(sent.hemoglobin).toBe(12);
    // Hb monomer basis, 1 g/dL = 0.6206 mmol/L: 7.45 mmol/L = 12.0 g/dL.
    expect(
      bloodGasPayload({ ...base, hemoglobin: 7.45, hemoglobinUnit: "mmol/L" }, extra).hemoglobin,
    ).toBe(12);
    expect(
      bloodGasPayload({ ...base, pressureUnit: "mmHg", pao2: 62, paco2: 40 }, extra),
    ).toMatchObject({
      pao2: 62,
      paco2: 40,
    });
    expect(sent.sampledAt).toBe("2026-12-01T10:00:00.000Z");
  });

  it("sends only the settings the device uses", () => {
    const hfnc = bloodGasPayload(base, extra);
    expect(hfnc).toMatchObject({ device: "hfnc", flow: 40, fio2: 0.4 });
    expect(hfnc).not.toHaveProperty("peep");
    const cannula = bloodGasPayload({ ...base, device: "nasal_cannula", flow: 2 }, extra);
    expect(cannula).not.toHaveProperty("fio2");
    expect(cannula).toMatchObject({ flow: 2 });
  });
});

describe("bloodGasFormSchema", () => {
  it("states pressure and haemoglobin ranges in the unit typed", () => {
    const parsed = bloodGasFormSchema.safeParse({ ...base, pao2: 100, hemoglobin: 300 });
    const messages = Object.fromEntries(
      parsed.error?.issues.map((i) => [i.path.join("."), i.message]) ?? [],
    );
    // 10–700 mmHg and 3–25 g/dL, re-stated.
    expect(messages.pao2).toBe("PaO2 must be between 1.34 and 93.32 kPa.");
    expect(messages.hemoglobin).toBe("Haemoglobin must be between 30 and 250 g/L.");
  });

  it("requires the flow and FiO2 an HFNC uses, and says what is missing", () => {
    const parsed = bloodGasFormSchema.safeParse({
      ...base,
      pao2: undefined,
      flow: undefined,
      fio2: undefined,
    });
    const messages = Object.fromEntries(
      parsed.error?.issues.map((i) => [i.path.join("."), i.message]) ?? [],
    );
    expect(messages).toMatchObject({
      pao2: "Enter PaO2.",
      flow: "Flow is required for High-flow nasal cannula.",
      fio2: "FiO2 is required for High-flow nasal cannula.",
    });
  });
});

function context(): BedsideContext {
  return {
    admission: {
      admissionId: 6,
      patientId: PATIENT_ID,
      bedId: 6,
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

beforeEach(() => {
  mocks.record.mockReset();
});

describe("BloodGasForm", () => {
  it("lets a kPa user type kPa, refuses a range in kPa before sending, and shows the stored indices after saving", async () => {
    mocks.record.mockImplementation((raw) => {
      const sent = raw as BloodGasPayload;
      const input = {
        fio2: 0.4,
        pao2: Number(sent.pao2),
        paco2: Number(sent.paco2),
        hemoglobin: Number(sent.hemoglobin),
        barometricPressure: 760,
        support: "hfnc" as const,
        flow: 40,
      };
      const view: BloodGasView = {
        id: 1,
        patientId: PATIENT_ID,
        sampledAt: "2026-12-01T10:00:00.000Z",
        sampleType: "arterial",
        pao2: input.pao2,
        paco2: input.paco2,
        fio2: 0.4,
        fio2Estimated: false,
        peep: null,
        device: "hfnc",
        barometricPressure: 760,
        assessment: assessBloodGas(input),
        engineVersion: ENGINE_VERSION,
      };
      return Promise.resolve({ ok: true, data: view });
    });
    render(
      <BloodGasForm patientId={PATIENT_ID} context={context()} pressureUnit="kPa" timeZone="UTC" />,
    );
    expect(field("Pressures in").value).toBe("kPa");
    // Prefilled from the applied settings.
    expect(field("Device").value).toBe("hfnc");
    expect(field("Flow (L/min)").value).toBe("40");
    expect(field("FiO2").value).toBe("0.4");

    type("PaO2 (kPa)", "100");
    type("PaCO2 (kPa)", "5,3"); // a decimal comma is a decimal point
    type("Haemoglobin", "120");
    type("Haemoglobin unit", "g/L");
    fireEvent.click(screen.getByRole("button", { name: "Save blood gas" }));
    await screen.findByText("PaO2 must be between 1.34 and 93.32 kPa.");
    expect(field("PaO2 (kPa)").getAttribute("aria-invalid")).toBe("true");
    expect(mocks.record).not.toHaveBeenCalled();

    type("PaO2 (kPa)", "8.0");
    fireEvent.click(screen.getByRole("button", { name: "Save blood gas" }));
    await screen.findByText("Arterial blood gas saved");
    expect(mocks.record.mock.calls[0]?.[0]).toMatchObject({
      pao2: 60,
      paco2: 39.8,
      hemoglobin: 12,
      fio2: 0.4,
      flow: 40,
    });
    // P/F = 60 / 0.4 = 150 mmHg = 20.0 kPa, shown in the user's unit.
    const pf = screen.getByText("P/F ratio", { selector: "p" }).closest("li");
    expect(pf?.textContent).toContain("20.0 kPa");

    fireEvent.click(screen.getByRole("button", { name: "Enter another blood gas" }));
    expect(field("PaO2 (kPa)").value).toBe("");
  });

  it("shows the server's refusal beside the field and keeps what was typed", async () => {
    mocks.record.mockResolvedValue({
      ok: false,
      status: 400,
      message: "Some fields need attention.",
      fieldErrors: {
        sampledAt: ["Time sampled must be within the last 72 hours and not in the future."],
      },
    });
    render(
      <BloodGasForm
        patientId={PATIENT_ID}
        context={context()}
        pressureUnit="mmHg"
        timeZone="UTC"
      />,
    );
    type("PaO2 (mmHg)", "62");
    type("PaCO2 (mmHg)", "40");
    fireEvent.click(screen.getByRole("button", { name: "Save blood gas" }));
    await screen.findByText("Time sampled must be within the last 72 hours and not in the future.");
    await waitFor(() => expect(field("Time sampled").getAttribute("aria-invalid")).toBe("true"));
    expect(field("PaO2 (mmHg)").value).toBe("62");
    expect(screen.getByTestId("form-status").textContent).toMatch(/nothing you typed was lost/);
  });

  it("calls a venous sample's pressures PvO2 and PvCO2", () => {
    render(
      <BloodGasForm
        patientId={PATIENT_ID}
        context={context()}
        pressureUnit="mmHg"
        timeZone="UTC"
      />,
    );
    fireEvent.click(screen.getByLabelText("Venous (VBG)"));
    expect(screen.getByLabelText("PvO2 (mmHg)")).toBeTruthy();
    expect(screen.getByLabelText("PvCO2 (mmHg)")).toBeTruthy();
  });

  it("points out a PaO2 typed in kPa under mmHg, and says nothing once the unit matches", async () => {
    render(
      <BloodGasForm
        patientId={PATIENT_ID}
        context={context()}
        pressureUnit="mmHg"
        timeZone="UTC"
      />,
    );
    fireEvent.change(screen.getByLabelText("PaO2 (mmHg)"), { target: { value: "8.2" } });
    const hint = await screen.findByTestId("pressure-unit-hint");
    expect(hint.textContent).toBe(
      'PaO2 8.2 looks like kPa, not mmHg: set "Pressures in" to kPa, or check the value.',
    );
    // The field is described by the hint, so a screen reader reads it with the value.
    expect(screen.getByLabelText("PaO2 (mmHg)").getAttribute("aria-describedby")).toContain(
      hint.id,
    );
    fireEvent.change(screen.getByLabelText("Pressures in"), { target: { value: "kPa" } });
    await waitFor(() => expect(screen.queryByTestId("pressure-unit-hint")).toBeNull());
  });
});
