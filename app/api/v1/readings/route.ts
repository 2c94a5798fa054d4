import { writeRoute } from "@/lib/boundary/next";
import { chartReadingOperation } from "@/lib/readings/operations";

/** Charts an SpO2 reading with the device and oxygen in use. */
export const POST = writeRoute(chartReadingOperation, {
  status: 201,
  respond: (reading) => ({ reading }),
});
