import type { Role } from "./roles";

/**
 * Where each role lands after sign-in and on "/": the reviewer reads reports,
 * everyone else starts at the Board of their units.
 */
export const HOME_BY_ROLE: Record<Role, string> = {
  physician: "/board",
  therapist: "/board",
  nurse: "/board",
  reviewer: "/reports",
  admin: "/board",
};

export function homePath(role: Role): string {
  return HOME_BY_ROLE[role];
}
