import { z } from "zod";

/** The read acknowledgement of an order change: the order in the path, no body. */
export const orderReadSchema = z.object({
  orderId: z.coerce.number().int().positive(),
});
export type OrderReadData = z.output<typeof orderReadSchema>;
