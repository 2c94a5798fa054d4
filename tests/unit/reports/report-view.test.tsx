import { render, screen, within } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { ReportTableView } from "@/components/reports/ReportTableView";
import { ReportView } from "@/components/reports/ReportView";
import { SummaryTiles } from "@/components/reports/SummaryTiles";
import { groupTable, alertKindTable } from "@/lib/reports/tables";
import { summaryTiles } from "@/lib/reports/tiles";
import { fixtureReport, PERIOD } from "../../fixtures/reports";

describe("summary tiles", () => {
  it("shows time in band as shares, the SpO2 states by word and colour token", () => {
    render(
      <SummaryTiles
        tiles={summaryTiles("time-in-band", fixtureReport("time-in-band", "patient"))}
        label="Whole unit"
      />,
    );
    const tiles = screen.getByLabelText("Whole unit");
    expect(within(tiles).getByTestId("tile-inBand").textContent).toBe("In band80.0%");
    expect(within(tiles).getByTestId("tile-below").className).toContain("text-below");
    expect(within(tiles).getByTestId("tile-above").textContent).toContain(
      "Above band on oxygen5.0",
    );
    expect(within(tiles).getByTestId("tile-patientHours").textContent).toBe("Patient time24.0h");
  });

  it("shows a dash without a unit for a measure with no value", () => {
    const report = fixtureReport("alerts", "patient");
    report.summary = {
      ...report.summary,
      escalationRate: null,
      toAcknowledge: { n: 0, median: null, p90: null },
    };
    render(<SummaryTiles tiles={summaryTiles("alerts", report)} label="Alerts" />);
    expect(screen.getByTestId("tile-escalated").textContent).toBe("Escalated–");
    expect(screen.getByTestId("tile-ack").textContent).toBe("To acknowledge, median–");
  });
});

describe("report tables", () => {
  it("lists one row per patient with the bed and a link to the Chart, and offers the CSV", () => {
    const table = groupTable(
      "time-in-band",
      fixtureReport("time-in-band", "patient"),
      "patient",
      "Time in band by patient",
    );
    render(<ReportTableView table={table} period={PERIOD} reportLabel="Time in band" />);
    const rows = screen.getAllByRole("row");
    expect(rows).toHaveLength(4);
    expect(
      within(rows[0]!)
        .getAllByRole("columnheader")
        .map((h) => h.textContent)
        .slice(0, 4),
    ).toEqual(["Patient", "Bed", "Patient time (h)", "In band (%)"]);
    const link = within(rows[1]!).getByRole("link", { name: "Testcase, Iris 1" });
    expect(link.getAttribute("href")).toBe("/patients/100");
    expect(
      within(rows[1]!)
        .getAllByRole("cell")
        .map((c) => c.textContent)
        .slice(0, 3),
    ).toEqual(["M01", "24.0", "80.0"]);
    expect(within(rows[2]!).getByText("1 of 3")).toBeTruthy();
    expect(
      screen.getByRole("button", { name: "Download CSV: Time in band by patient" }),
    ).toBeTruthy();
  });

  it("names each kind of alert in its own table", () => {
    render(
      <ReportTableView
        table={alertKindTable(fixtureReport("alerts", "patient"))}
        period={PERIOD}
        reportLabel="Alerts"
      />,
    );
    expect(screen.getByRole("rowheader", { name: "SpO2 below band" })).toBeTruthy();
  });

  it("says so when a table has no rows, and offers no CSV", () => {
    const table = groupTable("orders", fixtureReport("orders", "bed", 0), "bed", "Orders by bed");
    render(<ReportTableView table={table} period={PERIOD} reportLabel="Orders" />);
    expect(screen.getByText("Nothing in this period.")).toBeTruthy();
    expect(screen.queryByRole("button", { name: /Download CSV/ })).toBeNull();
  });
});

describe("the report view", () => {
  it("shows the empty state, the period, the caution and the basis when nobody was on the unit", () => {
    render(
      <ReportView
        set={{
          kind: "time-in-band",
          byPatient: fixtureReport("time-in-band", "patient", 0),
          byBed: fixtureReport("time-in-band", "bed", 0),
          overTime: fixtureReport("time-in-band", "day", 0),
          overTimeGroup: "day",
        }}
      />,
    );
    expect(screen.getByText("Nothing to report")).toBeTruthy();
    expect(screen.getByTestId("report-period").textContent).toBe(
      "MICU (Medical ICU), 2026-11-26 07:00 to 2026-12-03 07:00 (Europe/Oslo). Generated 2026-12-03 07:00.",
    );
    expect(screen.getByText(/Tidemark is decision support/)).toBeTruthy();
    expect(within(screen.getByTestId("report-basis")).getByText("Time in band")).toBeTruthy();
    expect(screen.queryAllByRole("button", { name: /Download CSV/ })).toHaveLength(0);
  });

  it("shows tiles, the tables over time, per bed and per patient for an oxygen exposure report", () => {
    render(
      <ReportView
        set={{
          kind: "oxygen-exposure",
          byPatient: fixtureReport("oxygen-exposure", "patient"),
          byBed: fixtureReport("oxygen-exposure", "bed"),
          overTime: fixtureReport("oxygen-exposure", "shift", 2),
          overTimeGroup: "shift",
        }}
      />,
    );
    expect(screen.getByTestId("tile-oxygenHours").textContent).toBe("On oxygen20.0h");
    expect(screen.getByTestId("table-oxygen-exposure-shift")).toBeTruthy();
    expect(screen.getByTestId("table-oxygen-exposure-bed")).toBeTruthy();
    expect(screen.getByTestId("table-oxygen-exposure-patient")).toBeTruthy();
    expect(screen.getAllByRole("button", { name: /Download CSV/ })).toHaveLength(3);
  });
});
