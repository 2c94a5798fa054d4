import { fireEvent, render, screen, waitFor } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { RehearsalForm } from "@/components/rehearsals/RehearsalForm";
import { rehearsalFormDefaults } from "@/lib/rehearsal/form-defaults";
import { doneRun } from "../../fixtures/rehearsals";

const DEFAULTS = rehearsalFormDefaults({
  unitId: 1,
  ventilatedTableId: 7,
  detection: { sustainMs: 60_000, sustainShare: 0.8, urgentBelowPct: 85, urgentSustainMs: 15_000 },
  escalateAfterMinutes: 10,
});

function renderForm() {
  const onQueued = vi.fn();
  render(
    <RehearsalForm
      defaults={DEFAULTS}
      ventilatedTables={[
        { id: 7, name: "ARDS Network lower PEEP / higher FiO2" },
        { id: 31, name: "MICU conservative PEEP ladder" },
      ]}
      hfncTables={[{ id: 40, name: "MICU high-flow weaning" }]}
      onQueued={onQueued}
    />,
  );
  return { onQueued };
}

const field = (label: string) => screen.getByLabelText(label) as HTMLInputElement;
const describedText = (input: HTMLElement) =>
  (input.getAttribute("aria-describedby") ?? "")
    .split(" ")
    .map((id) => document.getElementById(id)?.textContent ?? "")
    .join(" ");

afterEach(() => {
  vi.unstubAllGlobals();
});

describe("the New run form", () => {
  it("starts from the site's alert settings and the default cohort, with units in the labels", () => {
    renderForm();
    expect(field("Sustain window (s)").value).toBe("60");
    expect(field("Share out of band (%)").value).toBe("80");
    expect(field("Escalation after (min)").value).toBe("10");
    expect(field("SpO2 lower bound (%)").value).toBe("92");
    expect(field("Patients").value).toBe("40");
    expect(field("Seed (optional)").value).toBe("");
    expect(describedText(field("Seed (optional)"))).toContain(
      "Empty: a new seed is drawn and recorded",
    );
    const hfnc = screen.getByLabelText(
      "High-flow patients' step table (flow/FiO2)",
    ) as HTMLSelectElement;
    expect(hfnc.value).toBe("");
    expect(hfnc.options[0]!.textContent).toMatch(/^Default high-flow ladder/);
    for (const legend of ["Protocol", "Alert settings", "Response times", "Cohort"])
      expect(screen.getByRole("group", { name: legend })).toBeTruthy();
  });

  it("shows a refused value beside its field and posts nothing", async () => {
    const fetchMock = vi.fn<typeof fetch>();
    vi.stubGlobal("fetch", fetchMock);
    renderForm();
    fireEvent.change(field("Name of the run"), { target: { value: "Too high" } });
    fireEvent.change(field("SpO2 upper bound (%)"), { target: { value: "101" } });
    fireEvent.click(screen.getByRole("button", { name: "Run rehearsal" }));
    await waitFor(() =>
      expect(describedText(field("SpO2 upper bound (%)"))).toContain(
        "SpO2 upper bound must be between 70 and 100 %.",
      ),
    );
    expect(field("SpO2 upper bound (%)").getAttribute("aria-invalid")).toBe("true");
    expect(fetchMock).not.toHaveBeenCalled();
  });

  it("asks for a name before anything is sent", async () => {
    const fetchMock = vi.fn<typeof fetch>();
    vi.stubGlobal("fetch", fetchMock);
    renderForm();
    fireEvent.click(screen.getByRole("button", { name: "Run rehearsal" }));
    await waitFor(() => expect(describedText(field("Name of the run"))).toContain("Name the run"));
    expect(fetchMock).not.toHaveBeenCalled();
  });

  it("posts the parsed figures as JSON and hands the queued run on", async () => {
    const queued = doneRun({ id: 51, status: "queued", progress: 0, outcome: null });
    const fetchMock = vi.fn<typeof fetch>(() =>
      Promise.resolve(Response.json({ rehearsal: queued }, { status: 202 })),
    );
    vi.stubGlobal("fetch", fetchMock);
    const { onQueued } = renderForm();
    fireEvent.change(field("Name of the run"), { target: { value: "Conservative ladder" } });
    fireEvent.change(screen.getByLabelText("Ventilated patients' step table (FiO2/PEEP)"), {
      target: { value: "31" },
    });
    fireEvent.change(field("Patients"), { target: { value: "12" } });
    fireEvent.change(field("Length of each stay (h)"), { target: { value: "24" } });
    fireEvent.change(field("Nurse response, median (min)"), { target: { value: "2,5" } });
    fireEvent.click(screen.getByRole("button", { name: "Run rehearsal" }));
    await waitFor(() => expect(onQueued).toHaveBeenCalledWith(queued));
    const [url, init] = fetchMock.mock.calls[0]!;
    expect(url).toBe("/api/v1/rehearsals");
    expect(init?.method).toBe("POST");
    const body = JSON.parse(init?.body as string) as Record<string, unknown>;
    expect(body).toMatchObject({
      unitId: 1,
      label: "Conservative ladder",
      ventilatedTableId: 31,
      hfncTableId: null,
      patients: 12,
      hours: 24,
      nurseResponseMinutes: 2.5,
      spo2Lower: 92,
    });
    expect("seed" in body).toBe(false);
    expect(screen.getByTestId("form-status").textContent).toContain("Run #51");
  });

  it("puts the server's field errors beside their fields and keeps what was typed", async () => {
    vi.stubGlobal(
      "fetch",
      vi.fn<typeof fetch>(() =>
        Promise.resolve(
          Response.json(
            {
              error: {
                message: "Some values were refused.",
                fieldErrors: { ventilatedTableId: ["Choose a step table of this unit."] },
              },
            },
            { status: 400 },
          ),
        ),
      ),
    );
    renderForm();
    fireEvent.change(field("Name of the run"), { target: { value: "Kept" } });
    fireEvent.click(screen.getByRole("button", { name: "Run rehearsal" }));
    const select = screen.getByLabelText("Ventilated patients' step table (FiO2/PEEP)");
    await waitFor(() =>
      expect(describedText(select)).toContain("Choose a step table of this unit."),
    );
    expect(screen.getByTestId("form-status").textContent).toContain("Some values were refused.");
    expect(field("Name of the run").value).toBe("Kept");
  });
});
