import type { Metadata } from "next";
import Link from "next/link";
import { AccountFrame } from "@/components/accounts/AccountFrame";
import { SetPasswordForm } from "@/components/accounts/SetPasswordForm";
import { inspectAccountToken } from "@/lib/accounts/service";
import { db } from "@/lib/db";

export const metadata: Metadata = { title: "Set your password" };

/** The page an invitation or reset e-mail links to; the link's secret is in the query. */
export default async function SetPasswordPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const raw = (await searchParams).token;
  const token = typeof raw === "string" ? raw : "";
  const view = await inspectAccountToken(db(), token);
  if (view.state !== "valid") {
    return (
      <AccountFrame title="This link does not work">
        <p role="alert" className="mb-4 text-sm" data-testid="link-refused">
          {view.message}
        </p>
        <p className="flex flex-wrap gap-4 text-sm">
          <Link
            href="/forgot-password"
            className="font-medium text-accent underline-offset-2 hover:underline"
          >
            Ask for a new link
          </Link>
          <Link href="/sign-in" className="text-accent underline-offset-2 hover:underline">
            Sign in
          </Link>
        </p>
      </AccountFrame>
    );
  }
  const until = view.expiresAt.slice(0, 16).replace("T", " ");
  return (
    <AccountFrame
      title={view.kind === "invite" ? `Welcome, ${view.name}` : "Choose a new password"}
      intro={
        <>
          For <strong className="text-ink">{view.email}</strong>. This link works once, until{" "}
          {until} UTC.
          {view.kind === "reset" ? " Setting a new password signs you out everywhere." : ""}
        </>
      }
    >
      <SetPasswordForm token={token} email={view.email} />
    </AccountFrame>
  );
}
