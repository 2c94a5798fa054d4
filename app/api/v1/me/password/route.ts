import { writeRoute } from "@/lib/boundary/next";
import { changePasswordOperation } from "@/lib/accounts/operations";

/** Change one's own password: `{ currentPassword, password, confirmPassword }`. */
export const POST = writeRoute(changePasswordOperation, { respond: (result) => result });
