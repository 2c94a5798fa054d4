"use client";

import { useRouter, useSearchParams } from "next/navigation";
import { useCallback, useMemo, useState } from "react";
import useSWR from "swr";
import type { ApiRequestError } from "@/components/ui/api-json";
import { LoadError } from "@/components/ui/LoadError";
import { parseRehearsalSearch, rehearsalHref, toggleRun } from "@/lib/rehearsal/address";
import { isActive } from "@/lib/rehearsal/labels";
import type { RehearsalCreateInput } from "@/lib/rehearsal/schema";
import type { RehearsalListItem, RehearsalView } from "@/lib/rehearsal/views";
import { RehearsalForm, type TableOption } from "./RehearsalForm";
import { fetchRuns, listUrl } from "./rehearsal-request";
import { RunsList } from "./RunsList";
import { RunView, useRun } from "./RunView";
import { SideBySide } from "./SideBySide";

/** While any run of the list is queued or running, the list is asked for this often. */
const LIST_POLL_MS = 2000;

export type RehearsalFormSetup = {
  defaults: RehearsalCreateInput;
  ventilatedTables: TableOption[];
  hfncTables: TableOption[];
};

const listItem = (run: RehearsalView): RehearsalListItem => {
  const { outcome, ...rest } = run;
  return { ...rest, models: outcome?.models ?? null };
};

/**
 * The Rehearsal page below its heading: the form (for those who may run),
 * the unit's runs, the two chosen side by side and the chosen runs. The
 * choice lives in the address (`run`, `compare`), so it can be shared and
 * survives a reload; the runs come from the server's first answer and are
 * then polled while the worker has them.
 */
export function RehearsalWorkspace({
  unit,
  form,
  initialRuns,
  initialViews,
}: {
  unit: { id: number; code: string; name: string; timeZone: string };
  /** null: the actor may read runs but not start one. */
  form: RehearsalFormSetup | null;
  initialRuns: RehearsalListItem[];
  initialViews: RehearsalView[];
}) {
  const router = useRouter();
  const searchParams = useSearchParams();
  const search = searchParams.toString();
  const fromAddress = useMemo(() => {
    const params = new URLSearchParams(search);
    return parseRehearsalSearch({
      run: params.get("run") ?? undefined,
      compare: params.get("compare") ?? undefined,
    }).runs;
  }, [search]);
  // A choice shows at once; the address (and the server's answer) follow.
  const [optimistic, setOptimistic] = useState<{ runs: number[]; from: string } | null>(null);
  const chosen = optimistic && optimistic.from === search ? optimistic.runs : fromAddress;
  const [queued, setQueued] = useState<RehearsalView | null>(null);

  const list = useSWR<RehearsalListItem[], ApiRequestError>(listUrl(unit.id), fetchRuns, {
    fallbackData: initialRuns,
    refreshInterval: (latest) =>
      (latest ?? initialRuns).some((r) => isActive(r.status)) ? LIST_POLL_MS : 0,
    revalidateOnFocus: false,
  });
  const { mutate: mutateList } = list;
  const refreshList = useCallback(() => void mutateList(), [mutateList]);

  const initial = (id: number | undefined) =>
    initialViews.find((v) => v.id === id) ?? (queued && queued.id === id ? queued : undefined);
  const [idA, idB] = [chosen[0] ?? null, chosen[1] ?? null];
  const runA = useRun(idA, initial(chosen[0]), refreshList);
  const runB = useRun(idB, initial(chosen[1]), refreshList);

  const go = (runs: readonly number[]) => {
    setOptimistic({ runs: [...runs], from: search });
    router.push(rehearsalHref(unit.id, runs), { scroll: false });
  };

  const onQueued = (run: RehearsalView) => {
    setQueued(run);
    void mutateList((runs) => [listItem(run), ...(runs ?? []).filter((r) => r.id !== run.id)], {
      revalidate: true,
    });
    go([run.id]);
  };

  const runs = list.data ?? initialRuns;
  const views = [
    idA === null ? null : { id: idA, swr: runA },
    idB === null ? null : { id: idB, swr: runB },
  ].filter((v) => v !== null);

  return (
    <div className="space-y-6">
      {form ? (
        <RehearsalForm
          defaults={form.defaults}
          ventilatedTables={form.ventilatedTables}
          hfncTables={form.hfncTables}
          onQueued={onQueued}
        />
      ) : (
        <p className="rounded-card border border-border bg-surface px-3 py-2 text-sm print:hidden">
          Physicians and admins run rehearsals; everyone on {unit.code} reads the results here.
        </p>
      )}

      <section aria-labelledby="runs-heading" className="space-y-2">
        <h2 id="runs-heading" className="text-xl font-semibold">
          Runs on {unit.code}
        </h2>
        {list.error ? (
          <LoadError what="the runs" message={list.error.message} onRetry={refreshList} />
        ) : null}
        <RunsList
          unitId={unit.id}
          runs={runs}
          chosen={chosen}
          timeZone={unit.timeZone}
          onToggle={(id) => go(toggleRun(chosen, id))}
        />
        {runs.length > 0 && chosen.length === 0 ? (
          <p className="text-sm text-ink-muted">Choose a run by its name to see its results.</p>
        ) : null}
      </section>

      {idA !== null && idB !== null ? (
        <SideBySide a={runA.data} b={runB.data} timeZone={unit.timeZone} />
      ) : null}

      {views.map(({ id, swr }) => (
        <RunView
          key={id}
          id={id}
          run={swr.data}
          error={swr.error}
          onRetry={() => void swr.mutate()}
          timeZone={unit.timeZone}
          focusOnMount={queued?.id === id}
        />
      ))}
    </div>
  );
}
