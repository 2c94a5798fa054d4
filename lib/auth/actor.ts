import type { Role } from "./roles";

/** The signed-in user as every service sees it, loaded fresh from the database. */
export type Actor = {
  id: number;
  email: string;
  name: string;
  role: Role;
  unitIds: number[];
  pressureUnit: "mmHg" | "kPa";
  /** The session's row in user_sessions; set only for a change of one's own password (kept open). */
  sessionId?: string;
};
