import type { Metadata } from "next";
import { cookies } from "next/headers";
import { BoardView } from "@/components/board/BoardView";
import { Caution } from "@/components/ui/Caution";
import { pageActor } from "@/lib/auth/page-guard";
import { loadBoard } from "@/lib/board/queries";
import { loadMyWork } from "@/lib/board/my-work";
import { MyWorkPanels } from "@/components/board/MyWorkPanels";
import { db } from "@/lib/db";
import { resolveUnitChoice, UNIT_COOKIE } from "@/lib/preferences/unit";

export const metadata: Metadata = { title: "Board" };

export default async function BoardPage() {
  const actor = await pageActor();
  const { choice, unitIds } = resolveUnitChoice(
    (await cookies()).get(UNIT_COOKIE)?.value,
    actor.unitIds,
  );
  // The first paint comes from here; the client then refreshes from the same API.
  const [board, work] = await Promise.all([loadBoard(db(), unitIds), loadMyWork(db(), actor)]);
  const apiUrl = choice === "all" ? "/api/v1/board" : `/api/v1/board?unitId=${choice}`;

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h1 className="text-2xl font-semibold tracking-tight">Board</h1>
        <p className="text-sm text-ink-muted">
          {board.units
            .map((u) => `${u.unitCode}: ${u.occupiedBeds} of ${u.totalBeds} beds occupied`)
            .join(" · ")}
        </p>
      </div>
      <MyWorkPanels work={work} />
      <BoardView key={apiUrl} initial={board} apiUrl={apiUrl} pressureUnit={actor.pressureUnit} />
      <Caution compact />
    </div>
  );
}
