import { fireEvent, render, screen, waitFor } from "@testing-library/react";
import type { AnchorHTMLAttributes } from "react";
import { beforeEach, describe, expect, it, vi } from "vitest";
import { VentilatorCheckForm } from "@/components/ventilation/VentilatorCheckForm";
import type { recordVentilatorCheckAction } from "@/lib/ventilator-checks/actions";
import type { VentilatorCheckView } from "@/lib/ventilator-checks/queries";
import { evaluateCheck } from "@/lib/ventilation/evaluate";

const mocks = vi.hoisted(() => ({
  record: vi.fn<typeof recordVentilatorCheckAction>(),
  push: vi.fn(),
}));
vi.mock("@/lib/ventilator-checks/actions", () => ({ recordVentilatorCheckAction: mocks.record }));
vi.mock("next/navigation", () => ({ useRouter: () => ({ push: mocks.push, refresh: vi.fn() }) }));
vi.mock("next/link", () => ({
  default: ({ href, ...rest }: AnchorHTMLAttributes<HTMLAnchorElement> & { href: string }) => (
    <a href={href} {...rest} />
  ),
}));

// An invented patient: female, 165 cm, predicted body weight 57.0 kg.
const ORDER = {
  mode: "volume_control" as const,
  vtTargetMlKg: 6,
  vtMinMlKg: 4,
  vtMaxMlKg: 8,
  rateMin: 12,
  rateMax: 30,
  plateauLimit: 30,
  drivingLimit: 15,
  pbwKg: 57,
  heightCm: 165,
};

const type = (label: string, value: string) =>
  fireEvent.change(screen.getByLabelText(label, { exact: true }), { target: { value } });

beforeEach(() => {
  mocks.record.mockReset();
  mocks.push.mockReset();
});

describe("VentilatorCheckForm", () => {
  it("states the order's volumes in mL and refuses a plateau not above PEEP beside the field, without sending", async () => {
    render(<VentilatorCheckForm patientId={3} timeZone="UTC" ventilator={ORDER} />);
    expect(screen.getByTestId("check-order").textContent).toContain("VT 6 mL/kg PBW = 342 mL");
    expect(screen.getByTestId("check-order").textContent).toContain("8 mL/kg = 456 mL");
    type("Measured VT (mL)", "345");
    type("Measured rate (/min)", "22");
    type("Plateau", "10");
    type("Total PEEP", "10");
    fireEvent.click(screen.getByRole("button", { name: "Record check" }));
    await screen.findByText(
      "Plateau pressure must be at least total PEEP + 1 cmH2O (11 cmH2O here).",
    );
    expect(screen.getByLabelText("Plateau", { exact: true }).getAttribute("aria-invalid")).toBe(
      "true",
    );
    expect(mocks.record).not.toHaveBeenCalled();
  });

  it("sends the numbers with the time on the unit's clock, and says which limits the check is beyond", async () => {
    const indices = evaluateCheck(
      { measuredVtMl: 345, measuredRate: 22, totalPeep: 10, plateauPressure: 33 },
      { heightCm: 165, sex: "female" },
      "volume_control",
      null,
    );
    mocks.record.mockResolvedValueOnce({
      ok: true,
      data: {
        patientId: 3,
        indices,
        breaches: [{ what: "plateau", value: 33, limit: 30, unit: "cmH2O" }],
      } as VentilatorCheckView,
    });
    render(<VentilatorCheckForm patientId={3} timeZone="UTC" ventilator={ORDER} />);
    type("Measured VT (mL)", "345");
    type("Measured rate (/min)", "22");
    type("Plateau", "33");
    type("Peak", "38");
    type("Total PEEP", "10");
    type("Time checked", "2026-12-08T10:15");
    fireEvent.click(screen.getByRole("button", { name: "Record check" }));
    await waitFor(() => expect(mocks.record).toHaveBeenCalledTimes(1));
    expect(mocks.record.mock.calls[0]![0]).toMatchObject({
      patientId: 3,
      checkedAt: "2026-12-08T10:15:00.000Z",
      measuredVt: 345,
      measuredRate: 22,
      plateau: 33,
      peak: 38,
      totalPeep: 10,
    });
    await screen.findByText(
      /plateau pressure 33 cmH2O \(limit 30\)\. The therapist and physician are alerted/,
    );
    expect(mocks.push).toHaveBeenCalledWith("/patients/3");
  });
});
