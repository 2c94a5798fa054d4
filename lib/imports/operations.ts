import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { assertCan } from "../auth/permissions";
import { z } from "zod";
import { defineRead, defineWrite } from "../boundary/operation";
import { getImportPreview, listImports } from "./queries";
import { parseInput } from "../validation";
import { confirmImport, uploadForPreview } from "./service";
import { confirmSchema, uploadSchema } from "./upload-rules";

/**
 * Imports the good rows of a previewed file, given the count the person saw;
 * the rows are derived again from the stored file.
 */
export const confirmImportOperation = defineWrite({
  permission: "import.upload",
  schema: confirmSchema,
  run: (knex, actor, input, now) => confirmImport(knex, actor, input, now),
});

/**
 * The upload is a streamed multipart body, not a JSON operation: its route
 * reads the file under a cap and parses the form fields with `uploadSchema`.
 * This is the same door for callers that already hold the file (tests, tools).
 */
export async function previewUpload(
  knex: Knex,
  actor: Actor,
  fields: unknown,
  content: Buffer,
  now?: Date,
) {
  assertCan(actor, "import.upload");
  return uploadForPreview(knex, actor, parseInput(uploadSchema, fields), content, now);
}

/** The latest imports of the caller's units. */
export const listImportsOperation = defineRead({
  permission: "import.upload",
  schema: z.object({}),
  run: (knex, actor) => listImports(knex, actor),
});

/** An import's preview or, once imported, its report. */
export const readImportOperation = defineRead({
  permission: "import.upload",
  schema: z.object({ importId: z.number().int().positive() }),
  run: (knex, actor, { importId }) => getImportPreview(knex, actor, importId),
});
