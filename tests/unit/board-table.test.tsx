import { render, screen } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { BoardTable } from "@/components/board/BoardTable";
import type { BoardRow } from "@/lib/board/queries";

const row: BoardRow = {
  bedId: 1,
  bedLabel: "I01",
  unitId: 1,
  unitCode: "MICU",
  patientId: 1,
  patientInitials: "A.Q.",
  patientAge: 70,
  sex: "female",
  admittedAt: "2026-12-01T00:00:00.000Z",
  nurse: null,
  therapist: null,
  device: "invasive",
  deviceLabel: "Invasive ventilation",
  fio2: 0.5,
  fio2Estimated: false,
  peepCmH2o: 10,
  flowLMin: null,
  order: { id: 1, status: "active", lower: 88, upper: 95, reassessMinutes: 60 },
  latestSpo2: {
    pct: 91,
    fio2: 0.5,
    takenAt: "2026-12-01T10:00:00.000Z",
    source: "manual",
    belowOximeterAccuracy: false,
  },
  spo2Status: "in-band",
  timeInBand24h: { below: 0, inBand: 1, above: 0, unknown: 0 },
  latestPf: { ratio: 150, fio2Estimated: false, sampledAt: "2026-12-01T09:00:00.000Z" },
  lastReassessedAt: "2026-12-01T10:00:00.000Z",
  minutesSinceReassessment: 10,
  overdue: false,
  alerts: null,
  orderUnread: false,
};

const sort = { key: "bed", direction: "asc" } as const;

describe("Board table", () => {
  it("shows P/F in the user's pressure unit (1 kPa = 7.50062 mmHg)", () => {
    const { unmount } = render(
      <BoardTable
        rows={[row]}
        caption="beds"
        sort={sort}
        onSort={() => undefined}
        pressureUnit="mmHg"
      />,
    );
    expect(screen.getByText("150 mmHg")).toBeTruthy();
    unmount();
    render(
      <BoardTable
        rows={[row]}
        caption="beds"
        sort={sort}
        onSort={() => undefined}
        pressureUnit="kPa"
      />,
    );
    // 150 / 7.50062 = 19.998… → 20.0 kPa
    expect(screen.getByText("20.0 kPa")).toBeTruthy();
  });

  it("says 'No data' when nothing was measured, and never 100 % beside time out of band", () => {
    render(
      <BoardTable
        rows={[
          { ...row, timeInBand24h: { below: 0, inBand: 0, above: 0, unknown: 1 } },
          {
            ...row,
            bedId: 2,
            patientId: 7,
            // A fresh reading below band: 30 s of the last 24 h.
            timeInBand24h: { below: 30 / 86_400, inBand: 1 - 30 / 86_400, above: 0, unknown: 0 },
          },
        ]}
        caption="beds"
        sort={sort}
        onSort={() => undefined}
        pressureUnit="mmHg"
      />,
    );
    expect(screen.getByText("No data")).toBeTruthy();
    expect(screen.queryByText("0 %")).toBeNull();
    expect(screen.getByText(">99 %")).toBeTruthy();
    expect(screen.queryByText("100 %")).toBeNull();
  });

  it("shows a patient's open alerts in words, linked to the alerts page", () => {
    render(
      <BoardTable
        rows={[
          row,
          {
            ...row,
            bedId: 2,
            patientId: 7,
            alerts: {
              open: 2,
              unacknowledged: 1,
              urgent: true,
              kinds: ["below_band", "limits_exhausted"],
            },
          },
        ]}
        caption="beds"
        sort={sort}
        onSort={() => undefined}
        pressureUnit="mmHg"
      />,
    );
    expect(screen.getByLabelText("No open alerts")).toBeTruthy();
    const badge = screen.getByTestId("alert-count");
    expect(badge.textContent).toContain("1 to acknowledge · urgent");
    expect(badge.getAttribute("href")).toBe("/alerts?patientId=7");
    expect(badge.getAttribute("title")).toBe("SpO2 below target; Order limits reached");
  });

  it("shows a deep desaturation as charted, with the below-oximeter-accuracy mark", () => {
    render(
      <BoardTable
        rows={[
          {
            ...row,
            latestSpo2: { ...row.latestSpo2!, pct: 45, belowOximeterAccuracy: true },
            spo2Status: "below",
          },
        ]}
        caption="beds"
        sort={sort}
        onSort={() => undefined}
        pressureUnit="mmHg"
      />,
    );
    expect(screen.getByText("below oximeter accuracy")).toBeTruthy();
    expect(screen.getByText(/^45 %/)).toBeTruthy();
  });
});
