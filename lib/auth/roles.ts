/** The five roles (DEVELOPERS.md, "Roles"). */
export const ROLES = ["physician", "therapist", "nurse", "reviewer", "admin"] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  physician: "Physician",
  therapist: "Respiratory therapist",
  nurse: "Nurse",
  reviewer: "Reviewer",
  admin: "Administrator",
};

export function isRole(value: unknown): value is Role {
  return typeof value === "string" && (ROLES as readonly string[]).includes(value);
}
