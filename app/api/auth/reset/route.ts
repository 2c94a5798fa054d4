import { resetRequestRoute } from "@/lib/accounts/public-routes";

// A static segment beside [...nextauth]: Next matches it before the catch-all.
/** "Forgot password": `{ email }` → 202 with the same answer for every address. */
export const POST = resetRequestRoute;
