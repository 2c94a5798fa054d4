import { fireEvent, render, screen, within } from "@testing-library/react";
import { SWRConfig } from "swr";
import { afterEach, describe, expect, it, vi } from "vitest";
import { pressureText, Timeline } from "@/components/chart/Timeline";
import type { TimelineItem, TimelinePage } from "@/lib/chart/timeline";

const gas: TimelineItem = {
  cursor: "2026-03-04T08:30:00.000Z|blood_gas|7",
  kind: "blood_gas",
  id: 7,
  at: "2026-03-04T08:30:00.000Z",
  who: "Jonah Pell",
  summary: "Arterial blood gas on FiO2 0.50, PEEP 10 cmH2O",
  rationale: null,
  values: {
    sampleType: "arterial",
    pao2MmHg: 60,
    paco2MmHg: 45,
    pfRatio: 120,
    fio2: 0.5,
    peepCmH2O: 10,
  },
};
const reading: TimelineItem = {
  cursor: "2026-03-04T08:00:00.000Z|reading|31",
  kind: "reading",
  id: 31,
  at: "2026-03-04T08:00:00.000Z",
  who: null,
  summary: "Reading: SpO2 88 %, HFNC 40 L/min, FiO2 0.40, monitor",
  rationale: null,
  values: { spo2Pct: 88, fio2: 0.4, source: "monitor" },
};

function renderTimeline() {
  return render(
    <SWRConfig
      value={{ provider: () => new Map(), dedupingInterval: 0, shouldRetryOnError: false }}
    >
      <Timeline patientId={9} pressureUnit="kPa" />
    </SWRConfig>,
  );
}

afterEach(() => {
  vi.unstubAllGlobals();
});

describe("Timeline", () => {
  it("shows blood-gas pressures in the user's unit", () => {
    expect(pressureText(gas, "kPa")).toBe("PaO2 8.0 kPa, PaCO2 6.0 kPa, P/F 16.0 kPa");
    expect(pressureText(gas, "mmHg")).toBe("PaO2 60 mmHg, PaCO2 45 mmHg, P/F 120 mmHg");
    expect(pressureText(reading, "kPa")).toBeNull();
  });

  it("loads older entries by following the cursor, and a monitor reading is by 'Monitor'", async () => {
    const pages: TimelinePage[] = [
      { items: [gas], nextCursor: gas.cursor, timeZone: "UTC" },
      { items: [reading], nextCursor: null, timeZone: "UTC" },
    ];
    const fetchMock = vi.fn(() => Promise.resolve(Response.json(pages.shift())));
    vi.stubGlobal("fetch", fetchMock);
    renderTimeline();
    const table = await screen.findByTestId("timeline-table");
    expect(table.textContent).toContain("PaO2 8.0 kPa");
    fireEvent.click(screen.getByRole("button", { name: "Load older" }));
    await screen.findByText("Monitor");
    const calls = fetchMock.mock.calls as unknown as [string][];
    expect(calls[1]?.[0]).toBe(
      `/api/v1/patients/9/timeline?limit=25&before=${encodeURIComponent(gas.cursor)}`,
    );
    expect(screen.getByTestId("timeline-count").textContent).toMatch(
      /Showing 2 entries.*oldest entry/,
    );
    expect(screen.queryByRole("button", { name: "Load older" })).toBeNull();
  });

  it("filters by kind and says so when nothing of those kinds exists", async () => {
    const fetchMock = vi.fn((url: string) =>
      Promise.resolve(
        Response.json({
          items: url.includes("kinds=") ? [] : [gas],
          nextCursor: null,
          timeZone: "UTC",
        }),
      ),
    );
    vi.stubGlobal("fetch", fetchMock);
    renderTimeline();
    await screen.findByTestId("timeline-table");
    const filters = screen.getByTestId("timeline-filters");
    fireEvent.click(within(filters).getByRole("checkbox", { name: "Blood gases" }));
    await screen.findByText("No entries of these kinds");
    const calls = fetchMock.mock.calls as unknown as [string][];
    expect(calls.at(-1)?.[0]).toContain(`kinds=${encodeURIComponent("order,adjustment,reading")}`);
  });

  it("says in words when the timeline cannot be loaded", async () => {
    vi.stubGlobal(
      "fetch",
      vi.fn(() =>
        Promise.resolve(Response.json({ error: { message: "Server down" } }, { status: 500 })),
      ),
    );
    renderTimeline();
    expect(screen.getByTestId("timeline-loading")).toBeTruthy();
    const alert = await screen.findByRole("alert");
    expect(alert.textContent).toContain("The timeline could not be loaded: Server down");
  });
});
