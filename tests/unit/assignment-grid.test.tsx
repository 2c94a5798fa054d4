import { fireEvent, render, screen, waitFor } from "@testing-library/react";
import { beforeEach, describe, expect, it, vi } from "vitest";
import { AssignmentGrid } from "@/components/assignments/AssignmentGrid";
import type { ActionResult } from "@/lib/action-result";
import type { AssignmentGrid as Grid } from "@/lib/assignments/queries";
import type { AssignmentWriteResult } from "@/lib/assignments/service";

const setAssignmentsAction =
  vi.fn<(input: unknown) => Promise<ActionResult<AssignmentWriteResult>>>();
const refresh = vi.fn();

vi.mock("@/lib/assignments/actions", () => ({
  setAssignmentsAction: (input: unknown) => setAssignmentsAction(input),
}));
vi.mock("next/navigation", () => ({ useRouter: () => ({ refresh }) }));

const START = "2026-12-03T19:00:00.000Z";

function grid(over: Partial<Grid> = {}): Grid {
  return {
    unit: { id: 1, code: "MICU", name: "Medical ICU" },
    shift: { startsAt: START, endsAt: "2026-12-04T07:00:00.000Z", place: "next" },
    shifts: {
      previous: "2026-12-02T19:00:00.000Z",
      current: "2026-12-03T07:00:00.000Z",
      next: START,
    },
    beds: [
      {
        id: 11,
        label: "I01",
        occupant: { patientId: 5, initials: "M.Q." },
        cells: { nurse: { userId: 1, name: "Hana Whitlock" }, therapist: null, physician: null },
      },
      {
        id: 12,
        label: "I02",
        occupant: null,
        cells: { nurse: null, therapist: null, physician: null },
      },
    ],
    charge: null,
    candidates: {
      nurse: [
        { id: 1, name: "Hana Whitlock" },
        { id: 2, name: "Lior Brandt" },
      ],
      therapist: [{ id: 3, name: "Jonah Pell" }],
      physician: [{ id: 4, name: "Dr Tobias Renwick" }],
    },
    previous: {
      chargeNurseId: 2,
      cells: [
        { bedId: 11, duty: "nurse", userId: 2 },
        { bedId: 12, duty: "nurse", userId: 2 },
        { bedId: 12, duty: "therapist", userId: 99 }, // no longer a candidate
      ],
    },
    editable: true,
    editWhy: "You may edit this shift as the unit's charge nurse of the current shift.",
    ...over,
  };
}

const select = (name: string) => screen.getByLabelText(name) as HTMLSelectElement;

beforeEach(() => {
  setAssignmentsAction.mockReset();
  refresh.mockReset();
});

describe("the assignments grid", () => {
  it("fills only the empty cells from the previous shift, with people still on the unit", async () => {
    render(<AssignmentGrid grid={grid()} />);
    fireEvent.click(screen.getByRole("button", { name: "Copy from previous shift" }));
    expect(select("I01 nurse").value).toBe("1");
    expect(select("I02 nurse").value).toBe("2");
    expect(select("I02 therapist").value).toBe("");
    expect(select("Charge nurse").value).toBe("2");
    await screen.findByText(/Filled 2 empty cells from the previous shift/);
    expect(setAssignmentsAction).not.toHaveBeenCalled();
  });

  it("saves only the changed cells, for the shift's exact start, and names a refused cell beside it", async () => {
    setAssignmentsAction.mockResolvedValueOnce({
      ok: false,
      status: 400,
      message: "I02 physician: user 4 is not an active physician of MICU.",
      fieldErrors: {
        "cells.0.userId": ["I02 physician: user 4 is not an active physician of MICU."],
      },
    });
    render(<AssignmentGrid grid={grid()} />);
    fireEvent.change(select("I02 physician"), { target: { value: "4" } });
    fireEvent.click(screen.getByRole("button", { name: "Save" }));
    await waitFor(() => expect(setAssignmentsAction).toHaveBeenCalledTimes(1));
    expect(setAssignmentsAction).toHaveBeenCalledWith({
      unitId: 1,
      shift: START,
      cells: [{ bedId: 12, duty: "physician", userId: 4 }],
    });
    await waitFor(() => expect(select("I02 physician").getAttribute("aria-invalid")).toBe("true"));
    expect(screen.getAllByText(/user 4 is not an active physician/).length).toBeGreaterThan(0);
  });

  it("shows names and the reason, and no selects, to those who may not edit", () => {
    render(
      <AssignmentGrid
        grid={grid({ editable: false, editWhy: "Only the unit's charge nurse … assigns." })}
      />,
    );
    expect(screen.queryAllByRole("combobox")).toHaveLength(0);
    expect(screen.queryByRole("button", { name: "Save" })).toBeNull();
    expect(screen.getByText("Hana Whitlock")).toBeTruthy();
    expect(screen.getByText("Only the unit's charge nurse … assigns.")).toBeTruthy();
  });
});
