import { render, screen, within } from "@testing-library/react";
import type { AnchorHTMLAttributes } from "react";
import { describe, expect, it, vi } from "vitest";
import { RunsList } from "@/components/rehearsals/RunsList";
import { RunView } from "@/components/rehearsals/RunView";
import { SideBySide } from "@/components/rehearsals/SideBySide";
import { doneRun, listed, model, SETTINGS } from "../../fixtures/rehearsals";

vi.mock("next/link", () => ({
  default: ({ href, ...rest }: AnchorHTMLAttributes<HTMLAnchorElement> & { href: string }) => (
    <a href={href} {...rest} />
  ),
}));

const view = (run: ReturnType<typeof doneRun>) =>
  render(<RunView id={run.id} run={run} error={undefined} onRetry={() => {}} timeZone="UTC" />);

describe("a run", () => {
  it("shows a labelled progress bar in % while the worker has it, and no results yet", () => {
    view(doneRun({ status: "running", progress: 0.5, outcome: null, finishedAt: null }));
    const bar = screen.getByRole("progressbar", { name: "Rehearsal progress" });
    expect(bar.getAttribute("aria-valuenow")).toBe("50");
    expect(screen.getByText("Running: 1 of 2 patients (50 %).")).toBeTruthy();
    expect(screen.queryByTestId("model-tile-tidemark")).toBeNull();
  });

  it("says why a failed run failed", () => {
    view(doneRun({ status: "failed", outcome: null, error: "The worker stopped." }));
    expect(screen.getByRole("alert").textContent).toContain("The worker stopped.");
    expect(screen.queryByRole("progressbar")).toBeNull();
  });

  it("shows a finished run's tiles, its chart beside its table, the patients and the basis", () => {
    view(doneRun());
    expect(screen.queryByRole("progressbar")).toBeNull();
    const tile = screen.getByTestId("model-tile-tidemark");
    expect(within(tile).getByText("Nurses' alert burden: alerts per patient-day")).toBeTruthy();
    expect(screen.getByRole("figure").textContent).toContain("Where the cohort's time went");
    expect(screen.getByRole("button", { name: "Download CSV: Care models, run #12" })).toBeTruthy();
    expect(screen.getByRole("button", { name: "Download CSV: Per patient, run #12" })).toBeTruthy();
    const basis = screen.getByTestId("rehearsal-basis");
    expect(within(basis).getByText("Share ventilated")).toBeTruthy();
    expect(
      within(basis).getAllByText("ARDS Network lower PEEP / higher FiO2", { exact: false })[0],
    ).toBeTruthy();
    expect(within(basis).getByText("Seed")).toBeTruthy();
    // Asked for at 08:15 UTC, on a 24-hour clock.
    expect(document.querySelector('time[datetime="2026-12-03T08:15:00.000Z"]')?.textContent).toBe(
      "2026-12-03 08:15",
    );
  });
});

describe("the unit's runs", () => {
  const done = listed(doneRun());
  const running = listed(
    doneRun({ id: 13, label: "Running one", status: "running", outcome: null }),
  );
  const third = listed(doneRun({ id: 11, label: "Older" }));

  it("says so when there are none", () => {
    render(<RunsList unitId={1} runs={[]} chosen={[]} timeZone="UTC" onToggle={() => {}} />);
    expect(screen.getByText("No runs yet")).toBeTruthy();
  });

  it("lists name, who, when, cohort, status and the Tidemark workflow's time in band", () => {
    render(
      <RunsList unitId={1} runs={[running, done]} chosen={[]} timeZone="UTC" onToggle={() => {}} />,
    );
    const row = screen.getByTestId("run-12");
    expect(
      within(row).getByRole("link", { name: "Lower PEEP, 92–96 %" }).getAttribute("href"),
    ).toBe("/rehearsals?unit=1&run=12");
    expect(row.textContent).toContain(
      "Ines Varga · 2026-12-03 08:15 · 2 patients × 24 h · seed 42",
    );
    expect(within(row).getByTestId("run-status").textContent).toBe("Done");
    expect(row.textContent).toContain("Tidemark workflow in band: 80.0 %");
    expect(within(screen.getByTestId("run-13")).getByTestId("run-status").textContent).toBe(
      "Running",
    );
  });

  it("lets up to two runs be ticked; a third waits until one is unticked", () => {
    const onToggle = vi.fn();
    render(
      <RunsList
        unitId={1}
        runs={[running, done, third]}
        chosen={[12, 13]}
        timeZone="UTC"
        onToggle={onToggle}
      />,
    );
    const box = (name: string) => screen.getByRole("checkbox", { name }) as HTMLInputElement;
    expect(box("Choose “Lower PEEP, 92–96 %” (#12)").checked).toBe(true);
    expect(box("Choose “Older” (#11)").disabled).toBe(true);
    box("Choose “Running one” (#13)").click();
    expect(onToggle).toHaveBeenCalledWith(13);
  });
});

describe("two runs side by side", () => {
  const a = doneRun();
  const b = doneRun({
    id: 14,
    label: "MICU conservative PEEP ladder",
    settings: { ...SETTINGS, peepMax: 14 },
    outcome: {
      ...a.outcome!,
      models: [model("tidemark", 0.85), model("fixed-interval", 0.7), model("reference", 0.9)],
    },
  });

  it("waits, in words, until both are done, and already lists what differs", () => {
    render(<SideBySide a={a} b={{ ...b, status: "running", outcome: null }} timeZone="UTC" />);
    expect(
      screen.getByText(/The comparison appears when both runs are done/).textContent,
    ).toContain("MICU conservative PEEP ladder (#14) is running");
    expect(screen.getByText("PEEP maximum (cmH2O)")).toBeTruthy();
  });

  it("shows one table with both runs and the difference, and the grouped chart", () => {
    render(<SideBySide a={a} b={b} timeZone="UTC" />);
    const table = within(screen.getByTestId("rehearsal-table-compare")).getByRole("table");
    const headers = within(table)
      .getAllByRole("columnheader")
      .map((h) => h.textContent);
    expect(headers).toEqual(["Measure", "Care model", "Run A (#12)", "Run B (#14)", "B − A"]);
    expect(screen.getByTestId("rehearsal-table-compare").textContent).toContain(
      "Run A: Lower PEEP, 92–96 % (#12). Run B: MICU conservative PEEP ladder (#14).",
    );
    const row = within(table)
      .getAllByRole("row")
      .find((r) => r.textContent?.startsWith("In band, pooled (%)Tidemark workflow"))!;
    expect(
      within(row)
        .getAllByRole("cell")
        .map((c) => c.textContent),
    ).toEqual(["Tidemark workflow", "80.0", "85.0", "+5.0"]);
    expect(screen.getByRole("figure").textContent).toContain("Time in band (pooled) by care model");
    expect(
      screen.getByRole("button", { name: "Download CSV: Measures of run A and run B" }),
    ).toBeTruthy();
  });
});
