import { defineRead, defineWrite } from "../boundary/operation";
import { getAssignmentGrid } from "./queries";
import { assignmentReadSchema, assignmentWriteSchema } from "./schema";
import { setAssignments } from "./service";

/** One shift's grid; another unit's answers 404. */
export const readAssignmentsOperation = defineRead({
  permission: "record.read",
  schema: assignmentReadSchema,
  run: (knex, actor, input, now) => getAssignmentGrid(knex, actor, input, now),
});

/** Admins and the current shift's charge nurse (lib/assignments/may-assign.ts) set the current or next shift. */
export const setAssignmentsOperation = defineWrite({
  permission: "assignment.manage",
  schema: assignmentWriteSchema,
  run: (knex, actor, input, now) => setAssignments(knex, actor, input, now),
});
