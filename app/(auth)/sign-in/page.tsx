import type { Metadata } from "next";
import { getServerSession } from "next-auth";
import { redirect } from "next/navigation";
import { SignInForm } from "@/components/auth/SignInForm";
import { Caution } from "@/components/ui/Caution";
import { IconMark } from "@/components/ui/icons";
import { authOptions } from "@/lib/auth/options";

export const metadata: Metadata = { title: "Sign in" };

function safeCallback(value: string | string[] | undefined): string {
  const v = Array.isArray(value) ? value[0] : value;
  // Only same-site paths: an open redirect would let a link send staff elsewhere.
  return v && v.startsWith("/") && !v.startsWith("//") ? v : "/board";
}

export default async function SignInPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const params = await searchParams;
  const callbackUrl = safeCallback(params.callbackUrl);
  const session = await getServerSession(authOptions);
  if (session?.user?.id) redirect(callbackUrl);
  return (
    <main className="flex min-h-screen items-center justify-center px-4 py-10">
      <div className="w-full max-w-sm space-y-6">
        <div className="flex items-center gap-2 text-accent">
          <IconMark className="text-3xl" />
          <span className="text-2xl font-semibold tracking-tight text-ink">Tidemark</span>
        </div>
        <div className="rounded-card border border-border bg-surface p-6 shadow-card">
          <h1 className="mb-1 text-xl font-semibold">Sign in</h1>
          <p className="mb-5 text-sm text-ink-muted">Oxygen and ventilation orders for your units.</p>
          <SignInForm callbackUrl={callbackUrl} />
        </div>
        <Caution compact />
      </div>
    </main>
  );
}
