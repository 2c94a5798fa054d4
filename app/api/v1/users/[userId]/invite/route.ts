import { writeRoute } from "@/lib/boundary/next";
import { inviteUserOperation } from "@/lib/accounts/operations";

/** Send (or send again) an invitation link: `{ currentPassword }`; the old link stops working. */
export const POST = writeRoute(inviteUserOperation, {
  ids: { userId: "id" },
  status: 201,
  respond: (invitation) => ({ invitation }),
});
