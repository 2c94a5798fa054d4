"use client";

import { useId, useMemo, useState } from "react";
import useSWR from "swr";
import { EmptyState } from "@/components/ui/EmptyState";
import { IconWarning } from "@/components/ui/icons";
import type { BoardData } from "@/lib/board/queries";
import { getApiJson } from "@/components/ui/api-json";
import { BoardTable } from "./BoardTable";
import type { PressureUnit } from "@/lib/oxygen";
import {
  matchesStatus,
  sortRows,
  STATUS_FILTERS,
  type SortKey,
  type SortState,
  type StatusFilter,
} from "./board-sort";

/** How often the Board refreshes itself, besides on focus. */
export const BOARD_REFRESH_MS = 30_000;

const fetchBoard = (url: string) => getApiJson<BoardData>(url, "the Board");

/** 24-hour, as every time in the app ("04:17", never "04:17 AM"). */
function timeOf(iso: string): string {
  return new Date(iso).toLocaleTimeString("en-GB", {
    hour: "2-digit",
    minute: "2-digit",
    hourCycle: "h23",
  });
}

/**
 * The live Board: first painted from the server's data, then refreshed with SWR
 * every 30 s and when the window regains focus. Sorting and filtering happen
 * here, so a refresh keeps the chosen order and rows only move when a sorted
 * value changes.
 */
export function BoardView({
  initial,
  apiUrl,
  pressureUnit,
}: {
  initial: BoardData;
  apiUrl: string;
  pressureUnit: PressureUnit;
}) {
  const { data, error, isValidating } = useSWR<BoardData, Error>(apiUrl, fetchBoard, {
    fallbackData: initial,
    refreshInterval: BOARD_REFRESH_MS,
    revalidateOnFocus: true,
    revalidateOnMount: false,
    keepPreviousData: true,
  });
  const board = data ?? initial;
  const [sort, setSort] = useState<SortState>({ key: "bed", direction: "asc" });
  const [unitFilter, setUnitFilter] = useState<string>("all");
  const [statusFilter, setStatusFilter] = useState<StatusFilter>("all");
  const unitSelectId = useId();
  const statusSelectId = useId();

  const onSort = (key: SortKey) =>
    setSort((s) => ({ key, direction: s.key === key && s.direction === "asc" ? "desc" : "asc" }));

  const visibleUnits = board.units.filter(
    (u) => unitFilter === "all" || String(u.unitId) === unitFilter,
  );
  const rowsByUnit = useMemo(() => {
    const sorted = sortRows(
      board.beds.filter((r) => matchesStatus(r, statusFilter)),
      sort,
    );
    const map = new Map<number, typeof sorted>();
    for (const r of sorted) map.set(r.unitId, [...(map.get(r.unitId) ?? []), r]);
    return map;
  }, [board.beds, statusFilter, sort]);

  if (board.units.length === 0) {
    return (
      <EmptyState title="No units assigned to you">
        An administrator assigns units to each account. Until then there is nothing to show here.
      </EmptyState>
    );
  }

  const statusLabel = STATUS_FILTERS.find((s) => s.value === statusFilter)?.label ?? "";
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end gap-3">
        <div className="flex flex-col gap-1">
          <label htmlFor={unitSelectId} className="text-xs font-medium text-ink-muted">
            Unit
          </label>
          <select
            id={unitSelectId}
            value={unitFilter}
            onChange={(e) => setUnitFilter(e.target.value)}
            className="rounded border border-border-strong bg-surface px-2 py-1 text-sm"
          >
            <option value="all">All shown units</option>
            {board.units.map((u) => (
              <option key={u.unitId} value={String(u.unitId)}>
                {u.unitCode} · {u.unitName}
              </option>
            ))}
          </select>
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor={statusSelectId} className="text-xs font-medium text-ink-muted">
            Status
          </label>
          <select
            id={statusSelectId}
            value={statusFilter}
            onChange={(e) => setStatusFilter(e.target.value as StatusFilter)}
            className="rounded border border-border-strong bg-surface px-2 py-1 text-sm"
          >
            {STATUS_FILTERS.map((s) => (
              <option key={s.value} value={s.value}>
                {s.label}
              </option>
            ))}
          </select>
        </div>
        <p className="ml-auto text-xs text-ink-muted" aria-live="polite">
          {isValidating ? (
            "Refreshing…"
          ) : (
            <>
              Updated{" "}
              <time dateTime={board.now} suppressHydrationWarning>
                {timeOf(board.now)}
              </time>
            </>
          )}{" "}
          · refreshes every {BOARD_REFRESH_MS / 1000} s
        </p>
      </div>

      {error ? (
        <p
          role="alert"
          className="flex items-start gap-2 rounded-card border border-below/40 bg-below-soft px-4 py-2 text-sm text-below"
        >
          <IconWarning className="mt-0.5 shrink-0" />
          <span>
            {error.message} The Board shows the figures from {timeOf(board.now)} and keeps trying.
          </span>
        </p>
      ) : null}

      {visibleUnits.map((unit) => {
        const unitRows = rowsByUnit.get(unit.unitId) ?? [];
        return (
          <section key={unit.unitId} aria-labelledby={`unit-${unit.unitId}`} className="space-y-2">
            <h2 id={`unit-${unit.unitId}`} className="text-lg font-semibold">
              {unit.unitName} <span className="font-normal text-ink-muted">({unit.unitCode})</span>
            </h2>
            {unit.occupiedBeds === 0 ? (
              <EmptyState title="No occupied beds">
                Patients appear here when they are admitted to a bed on this unit.
              </EmptyState>
            ) : unitRows.length === 0 ? (
              <EmptyState title={`No beds with status “${statusLabel}”`}>
                Choose “Any status” to see every occupied bed on this unit.
              </EmptyState>
            ) : (
              <BoardTable
                rows={unitRows}
                caption={`Occupied beds, ${unit.unitName}`}
                sort={sort}
                onSort={onSort}
                pressureUnit={pressureUnit}
              />
            )}
          </section>
        );
      })}
    </div>
  );
}
