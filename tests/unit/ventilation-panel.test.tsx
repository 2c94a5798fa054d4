import { fireEvent, render, screen, within } from "@testing-library/react";
import type { AnchorHTMLAttributes } from "react";
import { describe, expect, it, vi } from "vitest";
import { VentilationPanel } from "@/components/ventilation/VentilationPanel";
import { evaluateCheck, lungProtectionBreaches } from "@/lib/ventilation/evaluate";
import type { VentilatorOrderSettings } from "@/lib/ventilation/settings";
import type { VentilatorCheckView } from "@/lib/ventilator-checks/queries";

vi.mock("next/link", () => ({
  default: ({ href, ...rest }: AnchorHTMLAttributes<HTMLAnchorElement> & { href: string }) => (
    <a href={href} {...rest} />
  ),
}));

// An invented patient: female, 165 cm (predicted body weight 57.0 kg).
const ORDER: VentilatorOrderSettings = {
  mode: "volume_control",
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
const limits = { vtTargetMlKg: 6, vtMinMlKg: 4, vtMaxMlKg: 8, plateauLimit: 30, drivingLimit: 15 };

function check(id: number, at: string, plateau: number | undefined): VentilatorCheckView {
  const values = { measuredVtMl: 345, measuredRate: 22, totalPeep: 10, plateauPressure: plateau };
  const indices = evaluateCheck(values, { heightCm: 165, sex: "female" }, "volume_control", null);
  return {
    id,
    patientId: 3,
    orderId: 9,
    checkedAt: at,
    mode: "volume_control",
    setVt: 340,
    measuredVt: 345,
    setRate: 22,
    measuredRate: 22,
    minuteVentilation: null,
    peak: null,
    plateau: plateau ?? null,
    totalPeep: 10,
    paco2: null,
    pbwKg: 57,
    indices,
    limits,
    breaches: lungProtectionBreaches(indices, values, limits),
    recordedBy: { id: 5, name: "Jonah Pell" },
    engineVersion: "1.0.0",
  };
}

function renderPanel(checks: VentilatorCheckView[], mayRecord = true) {
  return render(
    <VentilationPanel
      patientId={3}
      ventilator={ORDER}
      checks={checks}
      timeZone="UTC"
      pressureUnit="mmHg"
      mayRecord={mayRecord}
    />,
  );
}

describe("VentilationPanel", () => {
  it("shows the order in mL for this patient and an empty state before the first check", () => {
    renderPanel([]);
    expect(screen.getByTestId("ventilation-order").textContent).toContain("6 mL/kg PBW = 342 mL");
    expect(screen.getByText("No ventilator check yet")).toBeTruthy();
    expect(screen.getByRole("link", { name: "Record ventilator check" }).getAttribute("href")).toBe(
      "/patients/3/ventilator-checks/new",
    );
  });

  it("marks the latest check beyond the limits, names them, and opens a value's basis", () => {
    renderPanel([
      check(2, "2026-12-08T10:00:00.000Z", 33),
      check(1, "2026-12-08T08:00:00.000Z", 24),
    ]);
    const latest = screen.getByTestId("ventilation-latest");
    expect(latest.textContent).toContain("10:00");
    expect(latest.textContent).toContain("Beyond lung-protective limits");
    expect(latest.textContent).toContain(
      "plateau pressure 33 cmH2O (limit 30); driving pressure 23 cmH2O (limit 15)",
    );
    const driving = within(latest)
      .getAllByTestId("ventilation-tile")
      .find((t) => t.textContent?.startsWith("Driving pressure"))!;
    expect(driving.textContent).toContain("23.0");
    expect(driving.textContent).toContain("Above limit 15");
    fireEvent.click(within(driving).getByRole("button", { name: "Basis of Driving pressure" }));
    expect(driving.textContent).toContain("Amato");
    // No peak and no gas: said, not left blank.
    expect(latest.textContent).toContain("Not computed: needs both peak and plateau pressure.");
    expect(latest.textContent).toContain(
      "Not computed: no arterial PaCO2 in the 6 hours before the check.",
    );
    // The trend's table gives both checks, newest first.
    const rows = within(screen.getByTestId("ventilation-trend")).getAllByRole("row");
    expect(rows.slice(1).map((r) => r.textContent)).toEqual([
      "08 Dec, 10:006.13323.0",
      "08 Dec, 08:006.12414.0",
    ]);
  });

  it("says a check is within the limits, and offers no button to a role that may not record", () => {
    renderPanel([check(1, "2026-12-08T08:00:00.000Z", 24)], false);
    expect(screen.getByTestId("ventilation-latest").textContent).toContain("Within limits");
    expect(screen.queryByRole("link", { name: "Record ventilator check" })).toBeNull();
  });
});
