import { render, screen, within } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { StaySummary } from "@/components/chart/StaySummary";
import type { StayWindowSummary } from "@/lib/rollups/summary";

// Invented figures: a 24 h window of 1440 min, 6 h below, 12 h in band, 2 h above, 4 h unknown.
const day: StayWindowSummary = {
  label: "Last 24 h",
  from: "2026-12-01T08:00:00.000Z",
  to: "2026-12-02T08:00:00.000Z",
  windowMinutes: 1440,
  belowMinutes: 360,
  inBandMinutes: 720,
  aboveMinutes: 120,
  unknownMinutes: 240,
  below88Minutes: 45,
  below85Minutes: 150,
  belowAreaPctMin: 1234.4,
  minSpo2: 81,
  fio2HoursAboveRoomAir: 4.5678,
  hoursAtFio2AtLeast60: 3.25,
};

describe("StaySummary", () => {
  it("shows each window's shares of its own length and the exposure figures", () => {
    render(<StaySummary windows={[day, { ...day, label: "This stay", minSpo2: null }]} />);
    const row = (name: string) => screen.getByRole("row", { name: new RegExp(`^${name}`) });
    // 720 / 1440 = 50.0 %; 360 / 1440 = 25.0 %; 120 / 1440 = 8.3 %; 240 / 1440 = 16.7 %.
    expect(within(row("In band")).getAllByRole("cell")[0]?.textContent).toBe("50.0 %");
    expect(within(row("Below the band")).getAllByRole("cell")[0]?.textContent).toBe("25.0 %");
    expect(within(row("Above the band")).getAllByRole("cell")[0]?.textContent).toBe("8.3 %");
    expect(within(row("Unknown")).getAllByRole("cell")[0]?.textContent).toBe("16.7 %");
    // Under two hours in minutes, from two hours in hours.
    expect(within(row("SpO2 below 88")).getAllByRole("cell")[0]?.textContent).toBe("45 min");
    expect(within(row("SpO2 below 85")).getAllByRole("cell")[0]?.textContent).toBe("2.5 h");
    expect(within(row("Area below")).getAllByRole("cell")[0]?.textContent).toBe("1234 %·min");
    expect(within(row("FiO2-hours")).getAllByRole("cell")[0]?.textContent).toBe("4.57");
    expect(within(row("Lowest SpO2")).getAllByRole("cell")[1]?.textContent).toBe("—");
    expect(screen.getByText("Basis").tagName).toBe("SUMMARY");
  });
});
