import type { Knex } from "knex";

/** Where an admission lay over [from, to) (ms; `to` is Infinity while it lies there). */
export type Stay = {
  admissionId: number;
  patientId: number;
  bedId: number;
  unitId: number;
  from: number;
  to: number;
};

type StayRow = {
  admission_id: number;
  patient_id: number;
  bed_id: number;
  unit_id: number;
  started_at: Date;
  ended_at: Date | null;
};

/**
 * The stays of the given admissions, or of the given units overlapping
 * [from, to). An admission with no stay rows (written before they were kept,
 * or by a fixture) lies in its current bed from admission to discharge.
 */
export async function loadStays(
  knex: Knex | Knex.Transaction,
  where: { admissionIds?: readonly number[]; unitIds?: readonly number[]; from?: Date; to?: Date },
): Promise<Stay[]> {
  const { admissionIds, unitIds, from, to } = where;
  if ((admissionIds && admissionIds.length === 0) || (unitIds && unitIds.length === 0)) return [];
  const recorded = knex("admission_stays as s").select(
    "s.admission_id",
    "s.patient_id",
    "s.bed_id",
    "s.unit_id",
    "s.started_at",
    "s.ended_at",
  );
  const implied = knex("admissions as a")
    .join("beds as b", "b.id", "a.bed_id")
    .whereNotExists(
      knex("admission_stays as x").whereRaw("x.admission_id = a.id").select(knex.raw("1")),
    )
    .select(
      "a.id as admission_id",
      "a.patient_id",
      "a.bed_id",
      "b.unit_id",
      "a.admitted_at as started_at",
      "a.discharged_at as ended_at",
    );
  if (admissionIds) {
    void recorded.whereIn("s.admission_id", admissionIds);
    void implied.whereIn("a.id", admissionIds);
  }
  if (unitIds) {
    void recorded.whereIn("s.unit_id", unitIds);
    void implied.whereIn("b.unit_id", unitIds);
  }
  if (to) {
    void recorded.where("s.started_at", "<", to);
    void implied.where("a.admitted_at", "<", to);
  }
  if (from) {
    void recorded.where((q) => void q.whereNull("s.ended_at").orWhere("s.ended_at", ">", from));
    void implied.where(
      (q) => void q.whereNull("a.discharged_at").orWhere("a.discharged_at", ">", from),
    );
  }
  const [a, b] = (await Promise.all([recorded, implied])) as [StayRow[], StayRow[]];
  return [...a, ...b]
    .map((r) => ({
      admissionId: r.admission_id,
      patientId: r.patient_id,
      bedId: r.bed_id,
      unitId: r.unit_id,
      from: r.started_at.getTime(),
      to: r.ended_at ? r.ended_at.getTime() : Infinity,
    }))
    .sort((x, y) => x.from - y.from);
}

/** Opens the first stay of a new admission. */
export async function openStay(
  trx: Knex.Transaction,
  stay: { admissionId: number; patientId: number; bedId: number; unitId: number; at: Date },
): Promise<void> {
  await trx("admission_stays").insert({
    admission_id: stay.admissionId,
    patient_id: stay.patientId,
    bed_id: stay.bedId,
    unit_id: stay.unitId,
    started_at: stay.at,
  });
}

/**
 * Ends the admission's open stay at `at` and, for a move, opens the next. An
 * admission written without stay rows gets its history first, so the time
 * before the move stays with the old bed.
 */
export async function closeStay(
  trx: Knex.Transaction,
  admissionId: number,
  at: Date,
  next?: { bedId: number; unitId: number },
): Promise<void> {
  const [{ n }] = (await trx("admission_stays")
    .where({ admission_id: admissionId })
    .count({ n: "*" })) as [{ n: number | string }];
  if (Number(n) === 0) {
    await trx.raw(
      `INSERT INTO admission_stays (admission_id, patient_id, bed_id, unit_id, started_at, ended_at)
       SELECT a.id, a.patient_id, a.bed_id, b.unit_id, a.admitted_at, NULL
         FROM admissions a JOIN beds b ON b.id = a.bed_id WHERE a.id = ?`,
      [admissionId],
    );
  }
  const open = (await trx("admission_stays")
    .where({ admission_id: admissionId })
    .whereNull("ended_at")
    .first("id", "patient_id")) as { id: number; patient_id: number } | undefined;
  if (!open) return;
  await trx("admission_stays").where({ id: open.id }).update({ ended_at: at });
  if (next) await openStay(trx, { admissionId, patientId: open.patient_id, ...next, at });
}
