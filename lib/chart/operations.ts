import { z } from "zod";
import { defineRead } from "../boundary/operation";
import { getBedsideContext } from "./bedside";
import { listTimeline, TIMELINE_KINDS } from "./timeline";
import { getTrend } from "./trend";

// The Chart's reads, one per panel. Each loads the patient's open admission
// through the unit check (another unit's patient answers 404).

const patientId = z.coerce
  .number({ error: "patientId must be a positive whole number." })
  .int("patientId must be a positive whole number.")
  .positive("patientId must be a positive whole number.");

/**
 * Order in effect, applied settings, latest reading and gas, and the engine's
 * proposal. `useStaleBloodGas=1`: forecast from an arterial gas older than the
 * site's limit (a clinician's choice; otherwise such a gas is not used).
 */
export const readBedsideOperation = defineRead({
  permission: "record.read",
  schema: z.object({
    patientId,
    useStaleBloodGas: z.enum(["0", "1"], { error: "useStaleBloodGas must be 0 or 1." }).optional(),
  }),
  run: (knex, actor, input, now) =>
    getBedsideContext(knex, actor, input.patientId, {
      useStaleBloodGas: input.useStaleBloodGas === "1",
      ...(now ? { now } : {}),
    }),
});

const LIMIT_WORDS = "Limit must be a whole number from 1 to 200.";

/** The Chart's timeline, newest first: `kinds=order,reading&before=<cursor>&limit=50`. */
export const readTimelineOperation = defineRead({
  permission: "record.read",
  schema: z.object({
    patientId,
    kinds: z
      .string()
      .optional()
      .transform((v) => (v ? v.split(",").filter(Boolean) : []))
      .pipe(
        z.array(
          z.enum(TIMELINE_KINDS, { error: `Kinds must be among ${TIMELINE_KINDS.join(", ")}.` }),
        ),
      ),
    before: z.string().max(80, "The timeline position (before) is too long.").optional(),
    limit: z.coerce
      .number({ error: LIMIT_WORDS })
      .int(LIMIT_WORDS)
      .min(1, LIMIT_WORDS)
      .max(200, LIMIT_WORDS)
      .default(50),
  }),
  run: (knex, actor, query) =>
    listTimeline(knex, actor, query.patientId, {
      kinds: query.kinds,
      ...(query.before ? { before: query.before } : {}),
      limit: query.limit,
    }),
});

/** Longest range one request may ask for; the stay is clamped to the admission in getTrend. */
const MAX_SPAN_MS = 31 * 24 * 3600_000;

const isoTime = (field: string) =>
  z.iso
    .datetime({
      offset: true,
      error: `${field} must be an ISO 8601 time, e.g. 2026-12-01T08:00:00Z.`,
    })
    .transform((v) => new Date(v));

/** The Chart's trend between `from` and `to` (ISO times), SpO2 thinned when the range is long. */
export const readTrendOperation = defineRead({
  permission: "record.read",
  schema: z
    .object({ patientId, from: isoTime("From"), to: isoTime("To") })
    .superRefine((q, ctx) => {
      // A malformed time is a continuable issue in zod, so this check still
      // runs with the raw string in its place: nothing to compare then.
      if (!(q.from instanceof Date) || !(q.to instanceof Date)) return;
      const span = q.to.getTime() - q.from.getTime();
      if (span <= 0)
        ctx.addIssue({ code: "custom", path: ["to"], message: "To must be after from." });
      else if (span > MAX_SPAN_MS)
        ctx.addIssue({
          code: "custom",
          path: ["to"],
          message: "The range may span at most 31 days.",
        });
    }),
  run: (knex, actor, { patientId, from, to }) => getTrend(knex, actor, patientId, { from, to }),
});
