import { readRoute } from "@/lib/boundary/next";
import { readBoardOperation } from "@/lib/board/operations";

/** The Board of the caller's units, or of one with `?unitId=`. */
export const GET = readRoute(readBoardOperation, { respond: (board) => board });
