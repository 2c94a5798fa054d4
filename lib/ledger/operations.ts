import { z } from "zod";
import { can } from "../auth/permissions";
import { defineRead } from "../boundary/operation";
import { ledgerFilterSchema, listLedger } from "./queries";
import { chainUnitId, verifyLedger, type LedgerProblem } from "./verify";

/** Ledger rows of the caller's units, newest first; filters and a `before` cursor. */
export const readLedgerOperation = defineRead({
  permission: "record.read",
  schema: ledgerFilterSchema,
  run: (knex, actor, filter) => listLedger(knex, actor, filter),
});

/**
 * Walks every hash chain — or, with `mode=incremental`, only what follows the
 * last anchor — and compares the heads with that anchor. Reviewers and admins
 * see where a break is; others see which break only if it is on their units.
 */
export const verifyLedgerOperation = defineRead({
  permission: "record.read",
  schema: z.object({
    mode: z
      .enum(["full", "incremental"], { error: "Mode must be full or incremental." })
      .default("full"),
  }),
  run: async (knex, actor, { mode }) => {
    const result = await verifyLedger(knex, { mode });
    const broken = result.firstBroken;
    if (!broken || can(actor, "ledger.oversee")) return result;
    const visible = async (p: LedgerProblem) => {
      const unitId = await chainUnitId(knex, p.chainKey);
      return unitId !== null && actor.unitIds.includes(unitId);
    };
    const problems: LedgerProblem[] = [];
    for (const p of result.problems ?? []) if (await visible(p)) problems.push(p);
    return {
      ...result,
      problems,
      firstBroken: (await visible(broken))
        ? broken
        : {
            id: 0,
            chainKey: "outside your units",
            chainSeq: 0,
            problem:
              "a chain outside your units is broken; a reviewer or administrator can see where",
          },
    };
  },
});
