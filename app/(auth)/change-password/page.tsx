import type { Metadata } from "next";
import Link from "next/link";
import { AccountFrame } from "@/components/accounts/AccountFrame";
import { ChangePasswordForm } from "@/components/accounts/ChangePasswordForm";
import { SignOutButton } from "@/components/shell/SignOutButton";
import { pagePasswordChange } from "@/lib/auth/page-guard";

export const metadata: Metadata = { title: "Change password" };

/**
 * One's own password. A user whose password an administrator set is sent
 * here by every page and refused by every route until they change it.
 */
export default async function ChangePasswordPage() {
  const { actor, required } = await pagePasswordChange();
  return (
    <AccountFrame
      title={required ? "Choose your own password" : "Change your password"}
      intro={
        required ? (
          <>
            {actor.name}, the password you signed in with was set by an administrator. Choose one
            only you know before you continue.
          </>
        ) : (
          <>Your other sessions end; this one stays signed in.</>
        )
      }
    >
      <ChangePasswordForm next="/" />
      <div className="mt-4 flex items-center justify-between gap-3 text-sm">
        {required ? (
          <span className="text-ink-muted">Not now?</span>
        ) : (
          <Link href="/" className="text-accent underline-offset-2 hover:underline">
            Back
          </Link>
        )}
        <SignOutButton />
      </div>
    </AccountFrame>
  );
}
