import type { Knex } from "knex";
import type { TokenActor } from "../api-tokens/service";
import { isDbError } from "../db-errors";
import { DomainError } from "../errors";
import { Hl7MessageError } from "../imports/hl7";
import { parseAdt, type AdtMessage } from "../imports/hl7-adt";
import { parseImportTime } from "../imports/time";
import { appendLedger, lockPatientChain } from "../ledger/service";
import { bedFor, checkEventTime, openAdmissionFor, type AdmissionView } from "./lookups";
import { admitIn, dischargeIn, transferIn, type Doer } from "./service";
import { transact } from "../transaction";

/** What an ADT message did: the admission as it now stands (A08: the patient's new details). */
export type AdtOutcome = {
  trigger: AdtMessage["trigger"];
  controlId: string;
  admission: AdmissionView;
};

/** A refusal tied to the segment field it came from ("PV1-3", "PID-3"), as the API's field errors. */
function bySegment<T>(fieldName: string, run: () => Promise<T>): Promise<T> {
  return run().catch((error: unknown) => {
    if (error instanceof DomainError) {
      throw new DomainError(error.message, error.status, {
        [fieldName]: [error.message],
        ...(error.fieldErrors ?? {}),
      });
    }
    throw error;
  });
}

function eventTime(message: AdtMessage, timeZone: string, now: Date, earliest: Date): Date {
  const parsed = message.eventTime ? parseImportTime(message.eventTime, timeZone) : null;
  if (message.eventTime && !parsed) {
    throw new DomainError(`EVN-2 '${message.eventTime}' is not an HL7 date and time.`, 422, {
      "EVN-2": ["Not an HL7 date and time (YYYYMMDDHHMM[SS][+ZZZZ])."],
    });
  }
  return checkEventTime("EVN-2", "The event time (EVN-2)", parsed ?? undefined, now, earliest);
}

async function unitZone(knex: Knex, unitId: number): Promise<string> {
  const row = (await knex("units").where({ id: unitId }).first("time_zone")) as {
    time_zone: string;
  };
  return row.time_zone;
}

/**
 * Applies one HL7 v2 ADT message from an interface engine's write token:
 * A01 admits, A02 moves, A03 discharges, A08 updates the patient's details —
 * the same services as the screens, the ledger naming the interface. A
 * repeated MSH-10 answers the first outcome and changes nothing.
 */
export async function applyAdtMessage(
  knex: Knex,
  token: TokenActor,
  text: string,
  now: Date = new Date(),
): Promise<{ replayed: boolean; outcome: AdtOutcome }> {
  let message: AdtMessage;
  try {
    message = parseAdt(text);
  } catch (error) {
    if (error instanceof Hl7MessageError) {
      throw new DomainError(error.message, 422, { message: [error.message] });
    }
    throw error;
  }
  const earlier = await stored(knex, message.controlId);
  if (earlier) return { replayed: true, outcome: earlier };

  const doer: Doer = {
    ledger: { id: null, role: "interface" },
    unitIds: token.unitIds,
    userId: null,
  };
  const note = `HL7 ADT^${message.trigger} ${message.controlId}`;
  const p = message.patient;
  // Checks outside the transaction, each refusal named by the field it came from.
  let write: (trx: Knex.Transaction) => Promise<AdmissionView>;
  switch (message.trigger) {
    case "A01": {
      const bed = await bySegment("PV1-3", () => bedFor(knex, doer, message.location!));
      const at = eventTime(
        message,
        await unitZone(knex, bed.unit_id),
        now,
        new Date(now.getTime() - 7 * 86_400_000),
      );
      write = (trx) => admitIn(trx, doer, { ...p, rationale: note }, bed, at, now);
      break;
    }
    case "A02": {
      const from = await bySegment("PID-3", () => openAdmissionFor(knex, doer, { mrn: p.mrn }));
      const to = await bySegment("PV1-3", () => bedFor(knex, doer, message.location!));
      write = (trx) => transferIn(trx, doer, from, to, note, now);
      break;
    }
    case "A03": {
      const current = await bySegment("PID-3", () => openAdmissionFor(knex, doer, { mrn: p.mrn }));
      const at = eventTime(
        message,
        await unitZone(knex, current.unit.id),
        now,
        new Date(current.admittedAt),
      );
      write = (trx) =>
        dischargeIn(
          trx,
          doer,
          current,
          { disposition: message.disposition!, dischargedAt: at, note },
          now,
        );
      break;
    }
    case "A08": {
      const current = await bySegment("PID-3", () => openAdmissionFor(knex, doer, { mrn: p.mrn }));
      write = (trx) => updateDemographics(trx, doer, current, p, note, now);
      break;
    }
  }
  try {
    return await transact(knex, async (trx) => {
      const admission = await write(trx);
      const outcome: AdtOutcome = {
        trigger: message.trigger,
        controlId: message.controlId,
        admission,
      };
      await trx("adt_messages").insert({
        control_id: message.controlId,
        trigger_event: message.trigger,
        api_token_id: token.tokenId,
        patient_id: admission.patientId,
        outcome_json: JSON.stringify(outcome),
        received_at: now,
      });
      return { replayed: false, outcome };
    });
  } catch (error) {
    // Sent twice at once: the other delivery applied it; answer as it did.
    if (isDbError(error) && error.code === "ER_DUP_ENTRY") {
      const first = await stored(knex, message.controlId);
      if (first) return { replayed: true, outcome: first };
    }
    throw error;
  }
}

async function stored(knex: Knex, controlId: string): Promise<AdtOutcome | null> {
  const row = (await knex("adt_messages")
    .where({ control_id: controlId })
    .first("outcome_json")) as { outcome_json: string } | undefined;
  return row ? (JSON.parse(row.outcome_json) as AdtOutcome) : null;
}

/** A08: the registration system's name, birth date and sex replace the stored ones. */
async function updateDemographics(
  trx: Knex.Transaction,
  doer: Doer,
  current: AdmissionView,
  p: AdtMessage["patient"],
  note: string,
  now: Date,
): Promise<AdmissionView> {
  await lockPatientChain(trx, current.patientId);
  const before = (await trx("patients")
    .where({ id: current.patientId })
    .forUpdate()
    .first("family_name", "given_name", "birth_date", "sex", "version")) as {
    family_name: string;
    given_name: string;
    birth_date: Date | string;
    sex: string;
    version: number;
  };
  await trx("patients")
    .where({ id: current.patientId })
    .update({
      family_name: p.familyName,
      given_name: p.givenName,
      birth_date: p.birthDate,
      sex: p.sex,
      version: before.version + 1,
    });
  const birth =
    typeof before.birth_date === "string"
      ? before.birth_date.slice(0, 10)
      : before.birth_date.toISOString().slice(0, 10);
  await appendLedger(
    trx,
    doer.ledger,
    {
      action: "patient.update",
      entityType: "patient",
      entityId: current.patientId,
      patientId: current.patientId,
      unitId: current.unit.id,
      before: {
        familyName: before.family_name,
        givenName: before.given_name,
        birthDate: birth,
        sex: before.sex,
      },
      after: {
        familyName: p.familyName,
        givenName: p.givenName,
        birthDate: p.birthDate,
        sex: p.sex,
      },
      rationale: note,
    },
    now,
  );
  return { ...current, name: `${p.familyName}, ${p.givenName}` };
}
