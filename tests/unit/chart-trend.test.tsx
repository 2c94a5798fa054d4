import { fireEvent, render, screen, within } from "@testing-library/react";
import { SWRConfig } from "swr";
import { afterEach, describe, expect, it, vi } from "vitest";
import { rangeBounds } from "@/components/chart/chart-request";
import { TrendChart, trendDetails, TrendPlot } from "@/components/chart/TrendChart";
import type { Trend } from "@/lib/chart/trend";

const trend: Trend = {
  from: "2026-03-04T06:00:00.000Z",
  to: "2026-03-04T12:00:00.000Z",
  admittedAt: "2026-03-02T09:00:00.000Z",
  timeZone: "UTC",
  spo2: [
    { at: "2026-03-04T07:00:00.000Z", spo2Pct: 95 },
    { at: "2026-03-04T08:00:00.000Z", spo2Pct: 88 },
    { at: "2026-03-04T10:00:00.000Z", spo2Pct: 93 },
  ],
  spo2Count: 3,
  downsampled: false,
  bands: [
    {
      orderId: 1,
      from: "2026-03-04T06:00:00.000Z",
      to: "2026-03-04T09:00:00.000Z",
      lowerPct: 92,
      upperPct: 96,
    },
    {
      orderId: 2,
      from: "2026-03-04T09:00:00.000Z",
      to: "2026-03-04T12:00:00.000Z",
      lowerPct: 88,
      upperPct: 92,
    },
  ],
  settings: [
    { at: "2026-03-04T06:00:00.000Z", fio2: 0.4, peepCmH2O: 8, flowLMin: null, cause: "order" },
    {
      at: "2026-03-04T08:15:00.000Z",
      fio2: 0.5,
      peepCmH2O: 10,
      flowLMin: null,
      cause: "adjustment",
    },
  ],
  gases: [{ at: "2026-03-04T08:30:00.000Z", pao2MmHg: 60, pfRatio: 120 }],
};

afterEach(() => {
  vi.unstubAllGlobals();
});

describe("trend details", () => {
  it("reads SpO2 against the band in effect, the settings and the latest gas in the user's unit", () => {
    const at = Date.parse("2026-03-04T08:30:00.000Z");
    expect(trendDetails(trend, at, "kPa")).toEqual([
      "Wed 08:30",
      "SpO2 88 % (below band) at Wed 08:00",
      "Target band 92–96 %",
      "FiO2 0.50, PEEP 10 cmH2O",
      "Arterial gas at Wed 08:30: PaO2 8.0 kPa, P/F 16.0 kPa",
    ]);
    // The same reading is in band once the second order's band applies.
    expect(trendDetails(trend, Date.parse("2026-03-04T09:30:00.000Z"), "mmHg")[2]).toBe(
      "Target band 88–92 %",
    );
  });
});

describe("TrendPlot", () => {
  it("shades one band per order period and marks a below-band reading by shape", () => {
    const { container } = render(<TrendPlot trend={trend} pressureUnit="mmHg" />);
    expect(
      [...container.querySelectorAll("[data-band]")].map((g) => g.getAttribute("data-band")),
    ).toEqual(["92-96", "88-92"]);
    expect(container.querySelectorAll("svg[role=img] polygon.fill-below")).toHaveLength(1);
    expect(screen.getByText("PEEP (cmH2O)")).toBeTruthy();
    expect(screen.getAllByText("PaO2 (mmHg)")).toHaveLength(2);
  });

  it("has a text equivalent listing every value, pressures in kPa when chosen", () => {
    render(<TrendPlot trend={trend} pressureUnit="kPa" />);
    const table = screen.getByTestId("trend-table");
    const rows = within(table).getAllByRole("row");
    expect(rows).toHaveLength(1 + 2 + 3 + 2 + 1);
    expect(table.textContent).toContain("PaO2 8.0 kPa, P/F 16.0 kPa");
    expect(table.textContent).toContain("Adjustment");
  });

  it("draws the P/F axis in the user's pressure unit (1 kPa = 7.50062 mmHg)", () => {
    const { unmount } = render(<TrendPlot trend={trend} pressureUnit="mmHg" />);
    expect(screen.getByText("P/F (mmHg)")).toBeTruthy();
    // The axis reaches at least 400 mmHg, rounded to a nice number.
    expect(screen.getAllByText("400").length).toBeGreaterThan(0);
    unmount();
    render(<TrendPlot trend={trend} pressureUnit="kPa" />);
    expect(screen.getByText("P/F (kPa)")).toBeTruthy();
    expect(screen.queryByText("P/F (mmHg)")).toBeNull();
    expect(screen.queryByText("400")).toBeNull();
  });

  it("steps through moments with the arrow keys and announces the details", () => {
    render(<TrendPlot trend={trend} pressureUnit="mmHg" />);
    const plot = screen.getByTestId("trend-plot");
    fireEvent.keyDown(plot, { key: "Home" });
    expect(screen.getByTestId("trend-details").textContent).toContain("Wed 06:00");
    fireEvent.keyDown(plot, { key: "ArrowRight" });
    expect(screen.getByTestId("trend-details").textContent).toContain("SpO2 95 % (in band)");
    fireEvent.keyDown(plot, { key: "End" });
    expect(screen.getByTestId("trend-details").textContent).toContain("SpO2 93 %");
    fireEvent.keyDown(plot, { key: "Escape" });
    expect(screen.getByTestId("trend-details").textContent).toMatch(/Point at the chart/);
  });
});

describe("TrendChart", () => {
  // Three days ago, rounded to the minute so "Stay" starts exactly there.
  const admittedAt = new Date(
    Math.floor((Date.now() - 3 * 86_400_000) / 60_000) * 60_000,
  ).toISOString();
  function renderChart() {
    return render(
      <SWRConfig
        value={{ provider: () => new Map(), dedupingInterval: 0, shouldRetryOnError: false }}
      >
        <TrendChart patientId={9} pressureUnit="mmHg" admittedAt={admittedAt} />
      </SWRConfig>,
    );
  }

  it("asks for 24 h first and for the stay when chosen", async () => {
    const fetchMock = vi.fn(() => Promise.resolve(Response.json(trend)));
    vi.stubGlobal("fetch", fetchMock);
    renderChart();
    expect(screen.getByTestId("trend-loading")).toBeTruthy();
    await screen.findByTestId("trend-plot");
    expect((screen.getByRole("radio", { name: "24 h" }) as HTMLInputElement).checked).toBe(true);
    fireEvent.click(screen.getByRole("radio", { name: "Stay" }));
    await vi.waitFor(() => expect(fetchMock).toHaveBeenCalledTimes(2));
    const calls = fetchMock.mock.calls as unknown as [string][];
    expect(calls[1]?.[0]).toContain(`from=${encodeURIComponent(admittedAt)}`);
  });

  it("says when nothing is charted, and when loading fails offers a retry", async () => {
    const empty: Trend = { ...trend, spo2: [], spo2Count: 0, bands: [], settings: [], gases: [] };
    const answers = [
      Response.json(
        { error: { message: "No admitted patient with that id on your units." } },
        { status: 404 },
      ),
      Response.json(empty),
    ];
    vi.stubGlobal(
      "fetch",
      vi.fn(() => Promise.resolve(answers.shift() ?? Response.json(empty))),
    );
    renderChart();
    const alert = await screen.findByRole("alert");
    expect(alert.textContent).toContain("The trend could not be loaded: No admitted patient");
    fireEvent.click(within(alert).getByRole("button", { name: "Try again" }));
    await screen.findByText("Nothing charted in this range");
  });
});

describe("range bounds", () => {
  it("caps the stay at 31 days and rounds to whole minutes", () => {
    const now = Date.parse("2026-03-04T12:00:30.000Z");
    expect(rangeBounds("6h", "2026-03-01T00:00:00.000Z", now)).toEqual({
      from: "2026-03-04T06:01:00.000Z",
      to: "2026-03-04T12:01:00.000Z",
    });
    expect(rangeBounds("stay", "2025-01-01T00:00:00.000Z", now).from).toBe(
      "2026-02-01T12:01:00.000Z",
    );
  });
});
