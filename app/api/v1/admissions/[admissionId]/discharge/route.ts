import { dischargeOperation } from "@/lib/admissions/operations";
import { writeRoute } from "@/lib/boundary/next";

export const POST = writeRoute(dischargeOperation, {
  ids: ["admissionId"],
  respond: (admission) => ({ admission }),
});
