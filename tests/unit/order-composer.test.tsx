import { fireEvent, render, screen, waitFor, within } from "@testing-library/react";
import type { AnchorHTMLAttributes } from "react";
import { beforeEach, describe, expect, it, vi } from "vitest";
import {
  OrderComposer,
  type PhysicianChoice,
  type StepTableChoice,
} from "@/components/orders/OrderComposer";
import type { ActionResult } from "@/lib/action-result";
import type { OrderView } from "@/lib/orders/queries";

const writeOrderAction = vi.fn<(input: unknown) => Promise<ActionResult<OrderView>>>();
const push = vi.fn();
const refresh = vi.fn();

vi.mock("@/lib/orders/actions", () => ({
  writeOrderAction: (input: unknown) => writeOrderAction(input),
}));
vi.mock("next/navigation", () => ({ useRouter: () => ({ push, refresh }) }));
vi.mock("next/link", () => ({
  default: ({ href, ...rest }: AnchorHTMLAttributes<HTMLAnchorElement> & { href: string }) => (
    <a href={href} {...rest} />
  ),
}));

const STEP_TABLES: StepTableChoice[] = [
  { id: 1, name: "ARDS Network lower PEEP / higher FiO2", kind: "fio2_peep", unitOwn: false },
  { id: 9, name: "MICU high-flow weaning", kind: "flow_fio2", unitOwn: true },
];
const PHYSICIANS: PhysicianChoice[] = [
  { id: 2, name: "Dr Tobias Renwick", onDuty: true },
  { id: 1, name: "Dr Ines Varga", onDuty: false },
];

const CURRENT: OrderView = {
  id: 41,
  patientId: 7,
  admissionId: 7,
  unitId: 1,
  status: "active",
  device: "nasal_cannula",
  spo2Band: { lower: 94, upper: 98 },
  pao2Band: null,
  limits: { fio2Min: 0.24, fio2Max: 0.37, peepMin: null, peepMax: null, flowMin: 1, flowMax: 4 },
  initial: { fio2: 0.29, peep: null, flow: 2 },
  stepTableId: null,
  ventilator: null,
  reassessMinutes: 60,
  rationale: "Mild hypoxaemia",
  entryMode: "written",
  enteredBy: { id: 1, name: "Dr Ines Varga" },
  prescriber: { id: 1, name: "Dr Ines Varga" },
  readBackConfirmed: false,
  signedBy: { id: 1, name: "Dr Ines Varga" },
  signedAt: "2026-12-01T08:00:00.000Z",
  signatureMeaning:
    "I am the prescriber of this oxygen order and I have reviewed it for this patient.",
  cosignedBy: null,
  cosignedAt: null,
  discontinuedBy: null,
  discontinuedAt: null,
  discontinueReason: null,
  supersededBy: null,
  replacedOrderId: null,
  version: 1,
  createdAt: "2026-12-01T08:00:00.000Z",
};

function renderComposer(over: Partial<Parameters<typeof OrderComposer>[0]> = {}) {
  return render(
    <OrderComposer
      patient={{ id: 7, name: "Gideon Thornquist", bedLabel: "I07" }}
      signer="physician"
      pressureUnit="mmHg"
      timeZone="UTC"
      currentOrder={null}
      currentStepTableName={null}
      stepTables={STEP_TABLES}
      physicians={PHYSICIANS}
      {...over}
    />,
  );
}

const input = (label: string) => screen.getByLabelText(label, { exact: true }) as HTMLInputElement;
const type = (label: string, value: string) =>
  fireEvent.change(input(label), { target: { value } });
const sentInputs = () =>
  writeOrderAction.mock.calls.map(([sent]) => sent as Record<string, unknown>);

beforeEach(() => {
  writeOrderAction.mockReset();
  push.mockReset();
  refresh.mockReset();
});

describe("OrderComposer", () => {
  it("shows only the limits the chosen device uses, filled with that device's usual limits", () => {
    renderComposer();
    expect(screen.queryByLabelText("FiO2 minimum")).toBeNull();

    fireEvent.change(screen.getByLabelText("Delivery device"), { target: { value: "invasive" } });
    expect(input("FiO2 minimum").value).toBe("0.30");
    expect(input("FiO2 maximum").value).toBe("0.80");
    expect(input("PEEP minimum (cmH2O)").value).toBe("5");
    expect(input("PEEP maximum (cmH2O)").value).toBe("14");
    expect(screen.queryByLabelText("Flow minimum (L/min)")).toBeNull();
    const tables = within(screen.getByLabelText("Step table")).getAllByRole("option");
    expect(tables.map((o) => o.textContent)).toEqual([
      "None",
      "ARDS Network lower PEEP / higher FiO2 (built-in)",
    ]);

    fireEvent.change(screen.getByLabelText("Delivery device"), { target: { value: "hfnc" } });
    expect(input("Flow minimum (L/min)").value).toBe("30");
    expect(input("Flow maximum (L/min)").value).toBe("60");
    expect(input("FiO2 maximum").value).toBe("0.60");
    expect(screen.queryByLabelText("PEEP minimum (cmH2O)")).toBeNull();
  });

  it("refuses limits a device cannot deliver beside the field, without sending", async () => {
    renderComposer({ currentOrder: CURRENT });
    type("FiO2 maximum", "0.9");
    type("Rationale", "Step up for desaturation");
    type("Password to sign", "tidemark-demo");
    fireEvent.click(screen.getByRole("button", { name: "Sign order" }));
    await screen.findByText("Nasal cannula delivers FiO2 between 0.21 and 0.45.");
    expect(input("FiO2 maximum").getAttribute("aria-invalid")).toBe("true");
    expect(input("FiO2 maximum").value).toBe("0.9");
    expect(writeOrderAction).not.toHaveBeenCalled();
  });

  it("sends a kPa PaO2 band in mmHg, the order in effect to supersede, and one idempotency key for every retry", async () => {
    writeOrderAction.mockResolvedValueOnce({
      ok: false,
      status: 400,
      message: "The password does not match; nothing was signed.",
      fieldErrors: { password: ["The password does not match your account."] },
    });
    writeOrderAction.mockResolvedValueOnce({ ok: true, data: { ...CURRENT, id: 42 } });
    renderComposer({ currentOrder: CURRENT, pressureUnit: "kPa" });
    type("PaO2 lower (kPa)", "8");
    type("PaO2 upper (kPa)", "12");
    type("Rationale", "Targets for chronic lung disease");
    type("Password to sign", "wrong");
    fireEvent.click(screen.getByRole("button", { name: "Sign order" }));

    await screen.findByText("The password does not match your account.");
    expect(input("Password to sign").value).toBe("");
    expect(input("PaO2 lower (kPa)").value).toBe("8");
    expect(push).not.toHaveBeenCalled();

    type("Password to sign", "tidemark-demo");
    fireEvent.click(screen.getByRole("button", { name: "Sign order" }));
    await waitFor(() => expect(push).toHaveBeenCalledWith("/patients/7"));

    const [first, second] = sentInputs();
    // 8 kPa × 7.50062 = 60.0 mmHg; 12 kPa × 7.50062 = 90.0 mmHg (one decimal, as stored).
    expect(first).toMatchObject({
      entryMode: "written",
      patientId: 7,
      device: "nasal_cannula",
      pao2Lower: 60,
      pao2Upper: 90,
      fio2Min: 0.24,
      flowMax: 4,
      spo2Lower: 94,
      spo2Upper: 98,
      supersedesOrderId: 41,
      password: "wrong",
    });
    expect(first).not.toHaveProperty("prescriberId");
    expect(second?.password).toBe("tidemark-demo");
    expect(typeof first?.idempotencyKey).toBe("string");
    expect(second?.idempotencyKey).toBe(first?.idempotencyKey);
  });

  it("states a kPa range in kPa when the PaO2 typed is out of range", async () => {
    renderComposer({ currentOrder: CURRENT, pressureUnit: "kPa" });
    type("PaO2 lower (kPa)", "4");
    type("PaO2 upper (kPa)", "12");
    fireEvent.click(screen.getByRole("button", { name: "Sign order" }));
    await screen.findByText("PaO2 lower bound must be between 5.4 and 39.9 kPa (40–300 mmHg).");
  });

  it("shows a conflict with a reload link, keeping what was typed", async () => {
    writeOrderAction.mockResolvedValueOnce({
      ok: false,
      status: 409,
      message: "Another order (#43, by Dr Tobias Renwick) is now in effect for this patient.",
    });
    renderComposer({ currentOrder: CURRENT });
    type("Rationale", "Step down, saturations high");
    type("Password to sign", "tidemark-demo");
    fireEvent.click(screen.getByRole("button", { name: "Sign order" }));
    const alert = await screen.findByRole("alert");
    expect(alert.textContent).toContain("Another order (#43, by Dr Tobias Renwick)");
    expect(
      within(alert)
        .getByRole("link", { name: /Reload this page/ })
        .getAttribute("href"),
    ).toBe("/patients/7/orders/new");
    fireEvent.click(within(alert).getByRole("button", { name: /Show the order now in effect/ }));
    expect(refresh).toHaveBeenCalled();
    expect(input("Rationale").value).toBe("Step down, saturations high");
  });

  it("asks a nurse for the physician and the read-back naming them, and sends a telephone order", async () => {
    writeOrderAction.mockResolvedValueOnce({
      ok: true,
      data: { ...CURRENT, id: 44, status: "awaiting_cosign" },
    });
    renderComposer({ signer: "other", currentOrder: CURRENT });
    expect(screen.queryByLabelText("Password to sign")).toBeNull();
    type("Rationale", "Telephone order from the registrar");
    fireEvent.click(screen.getByLabelText("Telephone"));
    fireEvent.click(screen.getByRole("button", { name: "Enter telephone order" }));
    await screen.findByText("Name the physician who gave the order.");
    await screen.findByText("Confirm that you read the order back to the physician.");
    expect(writeOrderAction).not.toHaveBeenCalled();

    const select = screen.getByLabelText("Ordering physician");
    expect(within(select).getAllByRole("option")[1]?.textContent).toBe(
      "Dr Tobias Renwick (on duty for this bed)",
    );
    fireEvent.change(select, { target: { value: "1" } });
    fireEvent.click(
      screen.getByLabelText("I read the order back to Dr Ines Varga and they confirmed it."),
    );
    fireEvent.click(screen.getByRole("button", { name: "Enter telephone order" }));
    await waitFor(() => expect(push).toHaveBeenCalledWith("/patients/7"));
    expect(sentInputs()[0]).toMatchObject({
      entryMode: "telephone",
      prescriberId: 1,
      readBackConfirmed: true,
      supersedesOrderId: 41,
    });
    expect(sentInputs()[0]).not.toHaveProperty("password");
  });
});

describe("OrderComposer on a ventilator", () => {
  const FEMALE_165 = { pbwKg: 57, heightCm: 165, sex: "female" as const };

  it("shows the mL each tidal volume target gives this patient, and sends the ventilator settings", async () => {
    writeOrderAction.mockResolvedValueOnce({ ok: true, data: { ...CURRENT, id: 43 } });
    renderComposer({ bodyWeight: FEMALE_165 });
    fireEvent.change(screen.getByLabelText("Delivery device"), { target: { value: "invasive" } });
    expect((screen.getByLabelText("Mode") as HTMLSelectElement).value).toBe("volume_control");
    expect(input("Tidal volume target").value).toBe("6");
    // 6 × 57.0 kg = 342 mL; 8 × 57.0 = 456 mL (predicted body weight, ARDS Network equation).
    expect(screen.getByTestId("order-vtTarget-ml").textContent).toBe("342\u00a0mL");
    expect(screen.getByTestId("order-vtMax-ml").textContent).toBe("456\u00a0mL");
    type("Tidal volume target", "7");
    expect(screen.getByTestId("order-vtTarget-ml").textContent).toBe("399\u00a0mL");
    expect(screen.getByTestId("order-read-back").textContent).toContain(
      "7 mL/kg PBW (399\u00a0mL)",
    );

    type("Rationale", "ARDS, lung-protective ventilation");
    type("Password to sign", "tidemark-demo");
    fireEvent.click(screen.getByRole("button", { name: "Sign order" }));
    await waitFor(() => expect(writeOrderAction).toHaveBeenCalledTimes(1));
    expect(sentInputs()[0]).toMatchObject({
      device: "invasive",
      ventMode: "volume_control",
      vtTarget: 7,
      vtMin: 4,
      vtMax: 8,
      rateMin: 10,
      rateMax: 35,
      plateauLimit: 30,
      drivingLimit: 15,
    });
  });

  it("says the height is missing instead of showing a volume, and refuses a target outside its range beside the field", async () => {
    renderComposer({ bodyWeight: null });
    fireEvent.change(screen.getByLabelText("Delivery device"), { target: { value: "invasive" } });
    expect(screen.getByTestId("order-pbw").textContent).toContain("Height not recorded");
    expect(screen.getByTestId("order-vtTarget-ml").textContent).toBe("—");
    type("Tidal volume target", "12");
    type("Rationale", "ARDS, lung-protective ventilation");
    type("Password to sign", "tidemark-demo");
    fireEvent.click(screen.getByRole("button", { name: "Sign order" }));
    await screen.findByText("Tidal volume target must be between 4 and 10 mL/kg PBW.");
    expect(writeOrderAction).not.toHaveBeenCalled();
  });

  it("leaves the ventilator settings out for a device without a ventilator", async () => {
    writeOrderAction.mockResolvedValueOnce({ ok: true, data: { ...CURRENT, id: 44 } });
    renderComposer({ bodyWeight: FEMALE_165 });
    fireEvent.change(screen.getByLabelText("Delivery device"), { target: { value: "hfnc" } });
    expect(screen.queryByLabelText("Mode")).toBeNull();
    type("Rationale", "High flow for pneumonia");
    type("Password to sign", "tidemark-demo");
    fireEvent.click(screen.getByRole("button", { name: "Sign order" }));
    await waitFor(() => expect(writeOrderAction).toHaveBeenCalledTimes(1));
    expect(Object.keys(sentInputs()[0]!)).not.toContain("vtTarget");
  });
});
