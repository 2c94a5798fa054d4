import { admitOperation } from "@/lib/admissions/operations";
import { writeRoute } from "@/lib/boundary/next";

export const POST = writeRoute(admitOperation, {
  status: 201,
  respond: (admission) => ({ admission }),
});
