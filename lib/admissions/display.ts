/** "Mara Quillfeather" → "M.Q." — the Board shows initials, the Chart the full name. */
export function initialsOf(given: string, family: string): string {
  const first = (s: string) => s.trim().charAt(0).toUpperCase();
  return `${first(given)}.${first(family)}.`;
}

/** Whole years between birth and `at`, in UTC calendar terms. */
export function ageInYears(birth: Date, at: Date): number {
  let age = at.getUTCFullYear() - birth.getUTCFullYear();
  const beforeBirthday =
    at.getUTCMonth() < birth.getUTCMonth() ||
    (at.getUTCMonth() === birth.getUTCMonth() && at.getUTCDate() < birth.getUTCDate());
  if (beforeBirthday) age -= 1;
  return age;
}
