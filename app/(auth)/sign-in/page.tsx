import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { SignInForm } from "@/components/auth/SignInForm";
import { Caution } from "@/components/ui/Caution";
import { IconMark } from "@/components/ui/icons";
import { requireActor } from "@/lib/auth/guard";
import { safeCallbackPath } from "@/lib/auth/redirects";
import { SESSION_ENDED_MESSAGES } from "@/lib/auth/sessions";
import { PasswordChangeRequiredError } from "@/lib/errors";

export const metadata: Metadata = { title: "Sign in" };

/**
 * A live session goes straight on (to the change-password page first when an
 * administrator set the password); an ended or idle one (or none) sees the form.
 */
async function signedIn(): Promise<boolean | "change"> {
  try {
    await requireActor();
    return true;
  } catch (error) {
    return error instanceof PasswordChangeRequiredError ? "change" : false;
  }
}

export default async function SignInPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const params = await searchParams;
  // Only same-site paths: an open redirect would let a link send staff elsewhere.
  // Without one, "/" sends each role to its home (lib/auth/home.ts).
  const callbackUrl = params.callbackUrl === undefined ? "/" : safeCallbackPath(params.callbackUrl);
  const session = await signedIn();
  if (session === "change") redirect("/change-password");
  if (session) redirect(callbackUrl);
  const ended = params.ended === "idle" || params.ended === "ended" ? params.ended : null;
  const passwordSet = params.password === "set";
  const email = typeof params.email === "string" ? params.email.slice(0, 254) : "";
  return (
    <main className="flex min-h-screen items-center justify-center px-4 py-10">
      <div className="w-full max-w-sm space-y-6">
        <div className="flex items-center gap-2 text-accent">
          <IconMark className="text-3xl" />
          <span className="text-2xl font-semibold tracking-tight text-ink">Tidemark</span>
        </div>
        <div className="rounded-card border border-border bg-surface p-6 shadow-card">
          <h1 className="mb-1 text-xl font-semibold">Sign in</h1>
          <p className="mb-5 text-sm text-ink-muted">
            Oxygen and ventilation orders for your units.
          </p>
          {ended ? (
            <p
              role="status"
              className="mb-4 rounded-md border border-border bg-surface-muted px-3 py-2 text-sm"
              data-testid="session-ended"
            >
              {SESSION_ENDED_MESSAGES[ended]}
            </p>
          ) : null}
          {passwordSet ? (
            <p
              role="status"
              className="mb-4 rounded-md border border-border bg-surface-muted px-3 py-2 text-sm"
              data-testid="password-set"
            >
              Your password is set. Sign in with it.
            </p>
          ) : null}
          <SignInForm callbackUrl={callbackUrl} email={email} />
          <p className="mt-4 text-center text-sm">
            <Link
              href="/forgot-password"
              className="text-accent underline-offset-2 hover:underline"
            >
              Forgot your password?
            </Link>
          </p>
        </div>
        <Caution compact />
      </div>
    </main>
  );
}
