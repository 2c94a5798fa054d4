import { readRoute } from "@/lib/boundary/next";
import { readRehearsalOperation } from "@/lib/rehearsal/operations";

/** One rehearsal: its settings, progress and, once done, its outcome. */
export const GET = readRoute(readRehearsalOperation, {
  ids: ["rehearsalId"],
  respond: (rehearsal) => ({ rehearsal }),
});
