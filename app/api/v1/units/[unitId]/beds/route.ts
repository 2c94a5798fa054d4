import { writeRoute } from "@/lib/boundary/next";
import { createBedOperation } from "@/lib/units/operations";

export const POST = writeRoute(createBedOperation, {
  ids: ["unitId"],
  status: 201,
  respond: (bed) => ({ bed }),
});
