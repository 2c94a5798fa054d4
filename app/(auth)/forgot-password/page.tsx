import type { Metadata } from "next";
import { AccountFrame } from "@/components/accounts/AccountFrame";
import { ForgotPasswordForm } from "@/components/accounts/ForgotPasswordForm";
import { getEnv } from "@/lib/env";

export const metadata: Metadata = { title: "Forgot password" };
export const dynamic = "force-dynamic";

export default function ForgotPasswordPage() {
  return (
    <AccountFrame
      title="Forgot your password?"
      intro={`Type the e-mail you sign in with. If it belongs to an active account, we e-mail a link to choose a new password; it works once, for ${getEnv().RESET_LINK_MINUTES} minutes.`}
    >
      <ForgotPasswordForm />
    </AccountFrame>
  );
}
