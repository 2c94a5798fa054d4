import { defineRead, defineWrite } from "../boundary/operation";
import { recordHeight } from "./height";
import { searchPatients } from "./queries";
import {
  admitSchema,
  dischargeSchema,
  heightSchema,
  patientSearchSchema,
  transferSchema,
} from "./schema";
import { admitPatient, dischargePatient, transferPatient } from "./service";

export const admitOperation = defineWrite({
  permission: "admission.manage",
  schema: admitSchema,
  run: (knex, actor, input, now) => admitPatient(knex, actor, input, now),
});

export const transferOperation = defineWrite({
  permission: "admission.manage",
  schema: transferSchema,
  run: (knex, actor, input, now) => transferPatient(knex, actor, input, now),
});

export const dischargeOperation = defineWrite({
  permission: "admission.manage",
  schema: dischargeSchema,
  run: (knex, actor, input, now) => dischargePatient(knex, actor, input, now),
});

/** A patient's height, recorded at the bedside (a measurement, like a reading). */
export const recordHeightOperation = defineWrite({
  permission: "reading.chart",
  schema: heightSchema,
  run: (knex, actor, input, now) => recordHeight(knex, actor, input, now),
});

/** The header's search: patients of the actor's units by MRN, name or bed. */
export const searchPatientsOperation = defineRead({
  permission: "record.read",
  schema: patientSearchSchema,
  run: (knex, actor, { query }) => searchPatients(knex, actor, query),
});
