import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { duplicateIndex } from "../db-errors";
import { ConflictError, NotFoundError } from "../errors";
import { once } from "../idempotency";
import { appendLedger } from "../ledger/service";
import { resolveHandover } from "./handover";
import { readableUnit } from "./queries";
import type { HandoffAcknowledgeData } from "./schema";

export type AcknowledgedBed = {
  admissionId: number;
  bedLabel: string;
  acknowledgedAt: string;
  /** True when this nurse had already acknowledged it: nothing new was written. */
  alreadyAcknowledged: boolean;
};

export type HandoffAcknowledgeResult = {
  unitId: number;
  shiftStartsAt: string;
  beds: AcknowledgedBed[];
};

/**
 * The incoming nurse acknowledges the handoff of one or more beds of her unit
 * for one handover — one transaction, one ledger row per bed newly
 * acknowledged. Acknowledging a bed again is an idempotent replay: it answers
 * the first acknowledgement and writes nothing, so "acknowledge all my beds"
 * still works after one was done singly.
 */
export async function acknowledgeHandoff(
  knex: Knex,
  actor: Actor,
  input: HandoffAcknowledgeData,
  now: Date = new Date(),
): Promise<HandoffAcknowledgeResult> {
  const unit = await readableUnit(knex, actor, input.unitId);
  const { incoming } = resolveHandover(unit, input.shift, now);
  // One lock order (ascending ids) for the patients' chains, whatever the body's order.
  const admissionIds = [...new Set(input.admissionIds)].sort((a, b) => a - b);
  try {
    return await once(knex, actor.id, input.idempotencyKey, "handoff.acknowledge", async (trx) => {
      const beds: AcknowledgedBed[] = [];
      for (const admissionId of admissionIds) {
        const admission = (await trx("admissions as a")
          .join("beds as b", "b.id", "a.bed_id")
          .where("a.id", admissionId)
          .whereNull("a.discharged_at")
          .where("b.unit_id", unit.id)
          .where("b.active", true)
          .first("a.id", "a.patient_id", "b.label")) as
          { id: number; patient_id: number; label: string } | undefined;
        if (!admission)
          throw new NotFoundError(
            `Admission ${admissionId} is not in a bed on ${unit.code}; reload the handoff.`,
          );
        const existing = (await trx("handoff_acknowledgements")
          .where({
            admission_id: admissionId,
            shift_starts_at: incoming.startsAt,
            user_id: actor.id,
          })
          .forUpdate()
          .first("acknowledged_at")) as { acknowledged_at: Date } | undefined;
        if (existing) {
          beds.push({
            admissionId,
            bedLabel: admission.label,
            acknowledgedAt: existing.acknowledged_at.toISOString(),
            alreadyAcknowledged: true,
          });
          continue;
        }
        await trx("handoff_acknowledgements").insert({
          admission_id: admissionId,
          unit_id: unit.id,
          shift_starts_at: incoming.startsAt,
          user_id: actor.id,
          acknowledged_at: now,
        });
        await appendLedger(
          trx,
          actor,
          {
            action: "handoff.acknowledge",
            entityType: "admission",
            entityId: admissionId,
            patientId: admission.patient_id,
            unitId: unit.id,
            after: { shiftStartsAt: incoming.startsAt.toISOString(), bed: admission.label },
          },
          now,
        );
        beds.push({
          admissionId,
          bedLabel: admission.label,
          acknowledgedAt: now.toISOString(),
          alreadyAcknowledged: false,
        });
      }
      return { unitId: unit.id, shiftStartsAt: incoming.startsAt.toISOString(), beds };
    });
  } catch (error) {
    // The same nurse acknowledging the same bed twice at the same moment: the unique index decides.
    if (duplicateIndex(error) === "handoff_acknowledgements_once_unique")
      throw new ConflictError(
        "This handoff was being acknowledged at the same moment; reload to see it acknowledged.",
      );
    throw error;
  }
}
