import { tokenPasswordRoute } from "@/lib/accounts/public-routes";

// A static segment beside [...nextauth]: Next matches it before the catch-all.
/** Set a password from an e-mailed link: `{ token, password, confirmPassword }`. */
export const POST = tokenPasswordRoute;
