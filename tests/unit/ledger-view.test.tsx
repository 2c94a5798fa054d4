import { fireEvent, render, screen, within } from "@testing-library/react";
import { SWRConfig } from "swr";
import { afterEach, describe, expect, it, vi } from "vitest";
import {
  checkFilterValues,
  EMPTY_FILTERS,
  filterValuesFromSearch,
  searchFromFilterValues,
} from "@/components/ledger/LedgerFilters";
import { actionLabel, entityLabel, roleLabel } from "@/components/ledger/LedgerLabels";
import { LedgerTable, prettyJson } from "@/components/ledger/LedgerTable";
import { LedgerView } from "@/components/ledger/LedgerView";
import { formatInZone, utcToZonedLocal, zonedLocalToUtc } from "@/components/ledger/LedgerTime";
import { verificationMessage } from "@/components/ledger/VerifyChain";
import { LEDGER_ACTIONS } from "@/lib/ledger/vocabulary";
import type { LedgerEntryView } from "@/lib/ledger/queries";

// The page reads its filters from the address; here the address is a variable.
const search = vi.hoisted(() => ({ current: new URLSearchParams() }));
vi.mock("next/navigation", () => ({
  useRouter: () => ({ push: () => undefined }),
  usePathname: () => "/ledger",
  useSearchParams: () => search.current,
}));

const entry: LedgerEntryView = {
  id: 4021,
  chainKey: "patient:2",
  chainSeq: 17,
  occurredAt: "2026-03-04T13:05:09.000Z",
  actor: { id: 1, name: "Dr Ines Varga", role: "physician" },
  action: "order.write",
  entityType: "order",
  entityId: "88",
  patientId: 2,
  patient: { id: 2, mrn: "KH402187", name: "ADEBAYO, Tunde" },
  unitId: 1,
  before: null,
  after: '{"device":"hfnc","spo2Lower":92,"spo2Upper":96}',
  rationale: "Start HFNC after failed low-flow trial.",
  hash: "ab".repeat(32),
};

describe("ledger words", () => {
  it("gives every action of the vocabulary a label of its own", () => {
    const labels = LEDGER_ACTIONS.map(actionLabel);
    for (const [i, code] of LEDGER_ACTIONS.entries()) expect(labels[i]).not.toBe(code);
    expect(new Set(labels).size).toBe(labels.length);
    expect(actionLabel("order.write")).toBe("Order written and signed");
    expect(actionLabel("order.verbal")).toBe("Verbal/telephone order entered");
  });

  it("shows a code it does not know as the code, rather than nothing", () => {
    expect(actionLabel("order.archive")).toBe("order.archive");
    expect(entityLabel("blood_gas")).toBe("Blood gas");
    expect(roleLabel("therapist")).toBe("Respiratory therapist");
    expect(roleLabel("auditor")).toBe("auditor");
  });

  it("names the writers that are not people: the system and interface tokens", () => {
    expect(roleLabel("system")).toBe("Tidemark (automatic)");
    expect(roleLabel("interface")).toBe("Interface (API token)");
    expect(actionLabel("alert.escalate")).toBe("Alert escalated");
  });

  it("says whether the chain is intact, or where and why it breaks", () => {
    expect(verificationMessage({ ok: true, checked: 1204, firstBroken: null })).toBe(
      "Chain intact — 1,204 rows checked",
    );
    expect(
      verificationMessage({
        ok: false,
        checked: 40,
        firstBroken: {
          id: 41,
          chainKey: "patient:3",
          chainSeq: 7,
          problem: "row content does not match its hash",
        },
      }),
    ).toBe(
      "Broken link at row #41 (chain patient:3, position 7): row content does not match its hash",
    );
    expect(
      verificationMessage({
        ok: false,
        checked: 40,
        firstBroken: {
          id: 0,
          chainKey: "admin",
          chainSeq: 9,
          problem: "chain head expects row 9, last stored row is 8",
        },
      }),
    ).toMatch(/^Broken link at the chain head \(chain admin, position 9\)/);
  });

  it("names the anchor a verdict was checked against, and how many more problems there are", () => {
    const anchor = { createdAt: "2026-12-04T08:05:00.000Z", chains: 12 };
    expect(verificationMessage({ ok: true, checked: 3, firstBroken: null, anchor })).toBe(
      "Chain intact — 3 rows checked; heads match the anchor of 2026-12-04 08:05 UTC",
    );
    expect(
      verificationMessage({ ok: true, checked: 1, firstBroken: null, anchor, mode: "incremental" }),
    ).toBe("Chain intact — 1 row checked since the anchor of 2026-12-04 08:05 UTC");
    const truncated = {
      id: 0,
      chainKey: "patient:3",
      chainSeq: 9,
      problem: "chain ends at row 7 but the anchor recorded row 9",
    };
    expect(
      verificationMessage({
        ok: false,
        checked: 40,
        firstBroken: truncated,
        problems: [truncated, { ...truncated, problem: "head rewound" }],
        anchor,
      }),
    ).toBe(
      "Broken link at the chain head (chain patient:3, position 9): chain ends at row 7 but the anchor recorded row 9 — and 1 more problem",
    );
  });
});

describe("ledger times", () => {
  it("shows a stored UTC instant as wall-clock time in the unit's zone", () => {
    const instant = new Date("2026-07-01T10:15:30Z");
    expect(formatInZone(instant, "UTC")).toEqual({ date: "2026-07-01", time: "10:15:30" });
    // Vienna keeps summer time (UTC+2) in July.
    expect(formatInZone(instant, "Europe/Vienna")).toEqual({
      date: "2026-07-01",
      time: "12:15:30",
    });
    expect(utcToZonedLocal(instant, "Europe/Vienna")).toBe("2026-07-01T12:15:30");
    expect(utcToZonedLocal(new Date("2026-01-05T08:00:00Z"), "America/New_York")).toBe(
      "2026-01-05T03:00",
    );
  });

  it("reads a typed period in the zone back to the same UTC instant", () => {
    expect(zonedLocalToUtc("2026-07-01T12:15:30", "Europe/Vienna")?.toISOString()).toBe(
      "2026-07-01T10:15:30.000Z",
    );
    expect(zonedLocalToUtc("2026-01-05T03:00", "America/New_York")?.toISOString()).toBe(
      "2026-01-05T08:00:00.000Z",
    );
    // On the night the clocks go forward, either side of the change.
    expect(zonedLocalToUtc("2026-03-29T01:30", "Europe/Vienna")?.toISOString()).toBe(
      "2026-03-29T00:30:00.000Z",
    );
    expect(zonedLocalToUtc("2026-03-29T03:30", "Europe/Vienna")?.toISOString()).toBe(
      "2026-03-29T01:30:00.000Z",
    );
    expect(zonedLocalToUtc("2026-02-30T10:00", "UTC")).toBeUndefined();
    expect(zonedLocalToUtc("yesterday", "UTC")).toBeUndefined();
  });
});

describe("ledger filters", () => {
  it("round-trips through the address with times as UTC instants", () => {
    const values = {
      patientId: "2",
      mrn: "KH402187",
      actorId: "",
      action: "reading.chart",
      from: "2026-07-01T12:00",
      to: "",
    };
    const search = searchFromFilterValues(values, "Europe/Vienna");
    expect(search.toString()).toBe(
      "patientId=2&mrn=KH402187&action=reading.chart&from=2026-07-01T10%3A00%3A00.000Z",
    );
    expect(filterValuesFromSearch(search, "Europe/Vienna")).toEqual(values);
    expect(checkFilterValues(values)).toEqual({});
    expect(searchFromFilterValues(EMPTY_FILTERS, "UTC").toString()).toBe("");
  });

  it("names each mistyped filter in words", () => {
    const read = filterValuesFromSearch(
      new URLSearchParams("patientId=0&mrn=KH%20402&actorId=x&action=order.erase&from=soon"),
      "UTC",
    );
    expect(checkFilterValues(read)).toEqual({
      patientId: "Patient id must be a whole number above 0, such as 12.",
      mrn: "MRN must be 1 to 32 letters, digits or dashes, such as KH402150.",
      actorId: "Choose an actor from the list.",
      action: "Choose an action from the list.",
      from: "From must be a date and time, such as 2025-03-04 08:00.",
    });
    expect(
      checkFilterValues({ ...EMPTY_FILTERS, from: "2026-03-04T10:00", to: "2026-03-04T09:59:59" }),
    ).toEqual({ to: "To must be later than From." });
  });
});

describe("LedgerTable", () => {
  it("shows a row's time, actor, action, entity and rationale, with a link to the Chart", () => {
    render(
      <LedgerTable
        entries={[entry]}
        units={[{ id: 1, code: "MICU", timeZone: "Europe/Vienna" }]}
      />,
    );
    const row = screen.getByTestId("ledger-entry");
    // 13:05:09 UTC is 14:05:09 in Vienna in March (winter time, UTC+1).
    expect(row.querySelector("time")?.textContent).toBe("2026-03-0414:05:09 Europe/Vienna");
    expect(within(row).getByText("Dr Ines Varga")).toBeTruthy();
    expect(within(row).getByText("Physician")).toBeTruthy();
    expect(within(row).getByText("Order written and signed")).toBeTruthy();
    expect(within(row).getByTestId("ledger-entity").textContent).toBe("Order #88 · MICU");
    // Named as people know the patient: name and MRN, not a database id.
    expect(
      within(row).getByRole("link", { name: "ADEBAYO, Tunde · KH402187" }).getAttribute("href"),
    ).toBe("/patients/2");
    expect(within(row).getByText("Start HFNC after failed low-flow trial.")).toBeTruthy();
  });

  it("opens before/after with the JSON pretty-printed, and closes it again", () => {
    render(<LedgerTable entries={[entry]} units={[]} />);
    const button = screen.getByRole("button", { name: "Before / after of row 4021" });
    expect(button.getAttribute("aria-expanded")).toBe("false");
    expect(screen.queryByLabelText("After (JSON)")).toBeNull();
    fireEvent.click(button);
    expect(button.getAttribute("aria-expanded")).toBe("true");
    expect(screen.getByLabelText("After (JSON)").textContent).toBe(prettyJson(entry.after ?? ""));
    expect(screen.getByLabelText("After (JSON)").textContent).toContain('\n  "spo2Lower": 92,');
    expect(screen.getByText("Nothing before: this row created the record.")).toBeTruthy();
    // Field by field: a created record lists each field it was created with.
    const diff = screen.getByTestId("ledger-diff");
    expect(within(diff).getByText("Created with these fields")).toBeTruthy();
    expect(
      within(diff)
        .getAllByRole("rowheader")
        .map((h) => h.textContent),
    ).toEqual(["device", "spo2Lower", "spo2Upper"]);
    expect(screen.getByText("patient:2")).toBeTruthy();
    // Rows without a unit are shown in UTC, and say so.
    expect(screen.getByTestId("ledger-entry").querySelector("time")?.textContent).toContain(
      "13:05:09 UTC",
    );
    fireEvent.click(button);
    expect(button.getAttribute("aria-expanded")).toBe("false");
  });

  it("shows stored text that is not JSON as it is", () => {
    expect(prettyJson("not json {")).toBe("not json {");
  });
});

describe("LedgerView", () => {
  function renderView() {
    return render(
      <SWRConfig
        value={{ provider: () => new Map(), dedupingInterval: 0, shouldRetryOnError: false }}
      >
        <LedgerView units={[{ id: 1, code: "MICU", timeZone: "UTC" }]} actors={[]} timeZone="UTC" />
      </SWRConfig>,
    );
  }

  afterEach(() => {
    vi.unstubAllGlobals();
  });

  it("says in words when rows cannot be loaded, and loads them on retry", async () => {
    search.current = new URLSearchParams("patientId=2");
    const answers = [
      Response.json(
        { error: { message: "Something went wrong on our side; nothing was saved." } },
        { status: 500 },
      ),
      Response.json({ entries: [entry], nextBefore: null }),
    ];
    const fetchMock = vi.fn(() =>
      Promise.resolve(answers.shift() ?? Response.json({}, { status: 599 })),
    );
    vi.stubGlobal("fetch", fetchMock);
    renderView();
    expect(screen.getByTestId("ledger-loading")).toBeTruthy();
    const alert = await screen.findByRole("alert");
    expect(alert.textContent).toContain(
      "The ledger could not be loaded: Something went wrong on our side",
    );
    fireEvent.click(within(alert).getByRole("button", { name: "Try again" }));
    await screen.findByTestId("ledger-table");
    expect(screen.queryByRole("alert")).toBeNull();
    expect(fetchMock).toHaveBeenCalledWith(
      "/api/v1/ledger?patientId=2&limit=50",
      expect.anything(),
    );
    expect(screen.getByRole("link", { name: "Download CSV" }).getAttribute("href")).toBe(
      "/api/v1/ledger/export?patientId=2",
    );
  });

  it("shows the empty state when nothing matches", async () => {
    search.current = new URLSearchParams("action=order.cosign");
    vi.stubGlobal(
      "fetch",
      vi.fn(() => Promise.resolve(Response.json({ entries: [], nextBefore: null }))),
    );
    renderView();
    await screen.findByText("No ledger rows match these filters");
  });

  it("does not ask the server with filters it cannot read", async () => {
    search.current = new URLSearchParams("patientId=abc");
    const fetchMock = vi.fn(() =>
      Promise.resolve(Response.json({ entries: [], nextBefore: null })),
    );
    vi.stubGlobal("fetch", fetchMock);
    renderView();
    await screen.findByText("Patient id must be a whole number above 0, such as 12.");
    expect(screen.getByRole("alert").textContent).toMatch(
      /Some filters in this address cannot be read/,
    );
    expect(screen.queryByRole("link", { name: "Download CSV" })).toBeNull();
    expect(fetchMock).not.toHaveBeenCalled();
  });
});
