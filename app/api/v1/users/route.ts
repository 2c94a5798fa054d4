import { readRoute, writeRoute } from "@/lib/boundary/next";
import { createUserOperation, listUsersOperation } from "@/lib/users/operations";

export const GET = readRoute(listUsersOperation, { respond: (users) => ({ users }) });

export const POST = writeRoute(createUserOperation, {
  status: 201,
  respond: (user) => ({ user }),
});
