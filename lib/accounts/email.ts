import { noticeHtml } from "../alerts/email";

/**
 * The account e-mails: an invitation and a password-reset link. Pure. They
 * name the product, the person and how long the link works — never anything
 * about patients — and say what to do if the e-mail was not expected.
 */
export type AccountEmailInput = {
  kind: "invite" | "reset";
  name: string;
  email: string;
  link: string;
  /** How long the link works, in words ("72 hours", "30 minutes"). */
  validFor: string;
  invitedBy?: string;
};

export function composeAccountEmail(input: AccountEmailInput): {
  subject: string;
  text: string;
  html: string;
} {
  const invite = input.kind === "invite";
  const subject = invite
    ? "Your Tidemark account: choose a password"
    : "Tidemark: a link to set a new password";
  const title = invite
    ? `${input.name}, ${input.invitedBy ?? "an administrator"} opened a Tidemark account for you.`
    : `${input.name}, someone asked for a new Tidemark password for this address.`;
  const facts = [
    `Account: ${input.email}`,
    `The link works once, for ${input.validFor}.`,
    invite
      ? "Choose a password of at least 12 characters; then sign in with this address."
      : "Setting a new password signs your account out everywhere.",
  ];
  const note = invite
    ? "If you did not expect this, ignore the e-mail; no password is set until the link is used."
    : "If it was not you, ignore this e-mail: your password stays as it is.";
  const text = [title, ...facts, note, "", `Set your password: ${input.link}`].join("\n");
  const html = noticeHtml({ title, facts, note, link: input.link, linkText: "Set your password" });
  return { subject, text, html };
}

/** "72 hours", "1 hour", "30 minutes". */
export function durationWords(minutes: number): string {
  if (minutes % 60 === 0) {
    const hours = minutes / 60;
    return `${hours} hour${hours === 1 ? "" : "s"}`;
  }
  return `${minutes} minute${minutes === 1 ? "" : "s"}`;
}
