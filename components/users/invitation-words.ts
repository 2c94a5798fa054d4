import type { UserSummary } from "@/lib/users/queries";

/** How a user signs in, and where their invitation stands, in words for the admin screens. Pure. */
export function signInWords(
  user: Pick<UserSummary, "password" | "invitation">,
  now: Date = new Date(),
): { label: string; tone: "in-band" | "neutral" | "overdue"; detail: string } {
  const inv = user.invitation;
  const day = (iso: string) => iso.slice(0, 16).replace("T", " ") + " UTC";
  if (user.password === "own") {
    return inv?.state === "used"
      ? {
          label: "Invitation used",
          tone: "in-band",
          detail: `Chose a password from the invitation sent ${day(inv.sentAt)}.`,
        }
      : {
          label: "Password set",
          tone: "in-band",
          detail: "Signs in with a password of their own.",
        };
  }
  if (inv?.state === "pending" && Date.parse(inv.expiresAt) > now.getTime()) {
    return {
      label: "Invitation pending",
      tone: "neutral",
      detail: `Sent ${day(inv.sentAt)}; the link works until ${day(inv.expiresAt)}.`,
    };
  }
  if (inv && (inv.state === "expired" || inv.state === "pending")) {
    return {
      label: "Invitation expired",
      tone: "overdue",
      detail: `The link sent ${day(inv.sentAt)} expired ${day(inv.expiresAt)} unused. Send a new one.`,
    };
  }
  if (user.password === "set_by_admin") {
    return {
      label: "Must change password",
      tone: "neutral",
      detail: "Signs in with the password an administrator set and must change it first.",
    };
  }
  return {
    label: "No password yet",
    tone: "overdue",
    detail: "Cannot sign in until they set a password from an invitation.",
  };
}
