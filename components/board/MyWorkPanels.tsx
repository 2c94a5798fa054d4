import { DueSoonList } from "@/components/due-soon/DueSoonList";
import { OrderNoticeList } from "@/components/order-notices/OrderNoticeList";
import { WaitingRequests } from "@/components/order-requests/WaitingRequests";
import type { MyWork } from "@/lib/board/my-work";

/** What waits for the signed-in person: shown above the Board and on My beds. */
export function MyWorkPanels({ work }: { work: MyWork }) {
  if (!work.due && !work.notices && !work.waiting) return null;
  return (
    <div className="grid gap-4 lg:grid-cols-2">
      {work.waiting ? <WaitingRequests requests={work.waiting} /> : null}
      {work.due ? (
        <DueSoonList beds={work.due.beds} windowMinutes={work.due.windowMinutes} />
      ) : null}
      {work.notices ? <OrderNoticeList notices={work.notices} /> : null}
    </div>
  );
}
