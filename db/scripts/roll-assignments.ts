/**
 * `npx tsx db/scripts/roll-assignments.ts`: gives the current and next shift of
 * every unit assignments copied from earlier shifts where they have none (the
 * demo runs it after seeding, so a database seeded days ago still has a team).
 */
import "../../lib/local-env";
import { rollAssignments } from "../../lib/assignments/roll";
import { closeDb, db } from "../../lib/db";

async function main() {
  const rolled = await rollAssignments(db());
  for (const r of rolled) {
    console.log(`[assignments] unit ${r.unitId}: ${r.startsAt} ← ${r.from} (${r.cells} cells)`);
  }
  if (rolled.length === 0) console.log("[assignments] current and next shifts already assigned");
}

main()
  .catch((error: unknown) => {
    console.error(error);
    process.exitCode = 1;
  })
  .finally(() => void closeDb());
