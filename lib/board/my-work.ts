import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { can } from "../auth/permissions";
import { dueSoon, DUE_SOON_MINUTES, type DueSoonBed } from "../due-soon/queries";
import { unreadOrderNotices, type OrderNoticeView } from "../order-notices/queries";
import { listOrderRequests, type OrderRequestView } from "../order-requests/queries";

/** What waits for the signed-in person, above the Board and on My beds. */
export type MyWork = {
  /** Nurses and therapists: reassessments due within the hour, and order changes to read. */
  due: { windowMinutes: number; beds: DueSoonBed[] } | null;
  notices: OrderNoticeView[] | null;
  /** Physicians: order requests addressed to them and still open. */
  waiting: OrderRequestView[] | null;
};

export async function loadMyWork(
  knex: Knex,
  actor: Actor,
  now: Date = new Date(),
): Promise<MyWork> {
  const bedside = can(actor, "order_request.send");
  const answers = can(actor, "order_request.answer");
  const [beds, notices, requests] = await Promise.all([
    bedside ? dueSoon(knex, actor, now) : null,
    bedside ? unreadOrderNotices(knex, actor) : null,
    answers ? listOrderRequests(knex, actor, { status: "open", limit: 50 }) : null,
  ]);
  return {
    due: beds ? { windowMinutes: DUE_SOON_MINUTES, beds } : null,
    notices,
    waiting: requests ? requests.filter((r) => r.forMe) : null,
  };
}
