import { recordHeightOperation } from "@/lib/admissions/operations";
import { writeRoute } from "@/lib/boundary/next";

/** Records the patient's height: `{ heightCm }` (130–230 cm, the predicted body weight equation's range). */
export const POST = writeRoute(recordHeightOperation, {
  ids: ["patientId"],
  respond: (height) => ({ height }),
});
