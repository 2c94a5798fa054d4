import { writeRoute } from "@/lib/boundary/next";
import { confirmImportOperation } from "@/lib/imports/operations";

/**
 * Imports the good rows of a previewed file: body `{ expectedAccepted }`, the
 * count the person saw. 201 when rows were written, 200 when already imported.
 */
export const POST = writeRoute(confirmImportOperation, {
  ids: ["importId"],
  status: (preview) => (preview.alreadyImported ? 200 : 201),
  respond: (preview) => ({ import: preview }),
});
