import { transferOperation } from "@/lib/admissions/operations";
import { writeRoute } from "@/lib/boundary/next";

export const POST = writeRoute(transferOperation, {
  ids: ["admissionId"],
  respond: (admission) => ({ admission }),
});
