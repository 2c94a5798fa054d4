import { defineRead, defineWrite } from "../boundary/operation";
import { listOrderRequests } from "./queries";
import { orderRequestFilterSchema, orderRequestReplySchema, orderRequestSchema } from "./schema";
import { replyToOrderRequest, sendOrderRequest } from "./service";

/** A therapist or nurse asks the responsible physician for a new order. */
export const sendOrderRequestOperation = defineWrite({
  permission: "order_request.send",
  schema: orderRequestSchema,
  run: (knex, actor, input, now) => sendOrderRequest(knex, actor, input, now),
});

/** A physician answers a request without an order, with the reason; it closes. */
export const replyOrderRequestOperation = defineWrite({
  permission: "order_request.answer",
  schema: orderRequestReplySchema,
  run: (knex, actor, input, now) => replyToOrderRequest(knex, actor, input, now),
});

/**
 * Requests on the caller's units: `status` open (default), closed or all,
 * `patientId`, `requestId`; open ones addressed to the caller come first.
 */
export const listOrderRequestsOperation = defineRead({
  permission: "record.read",
  schema: orderRequestFilterSchema,
  run: (knex, actor, filter) => listOrderRequests(knex, actor, filter),
});
