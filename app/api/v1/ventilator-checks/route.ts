import { readRoute, writeRoute } from "@/lib/boundary/next";
import {
  readVentilatorChecksOperation,
  recordVentilatorCheckOperation,
} from "@/lib/ventilator-checks/operations";

/** Records a ventilator check and returns it with its computed values and their basis. */
export const POST = writeRoute(recordVentilatorCheckOperation, {
  status: 201,
  respond: (ventilatorCheck) => ({ ventilatorCheck }),
});

/** A patient's ventilator checks (`?patientId&limit`), newest first. */
export const GET = readRoute(readVentilatorChecksOperation, {
  respond: (ventilatorChecks) => ({ ventilatorChecks }),
});
