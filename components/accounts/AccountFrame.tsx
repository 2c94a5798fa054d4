import type { ReactNode } from "react";
import { IconMark } from "@/components/ui/icons";

/** The narrow card the sign-in and account pages share (no header: these come before the app). */
export function AccountFrame({
  title,
  intro,
  children,
}: {
  title: string;
  intro?: ReactNode;
  children: ReactNode;
}) {
  return (
    <main className="flex min-h-screen items-center justify-center px-4 py-10">
      <div className="w-full max-w-sm space-y-6">
        <div className="flex items-center gap-2 text-accent">
          <IconMark className="text-3xl" />
          <span className="text-2xl font-semibold tracking-tight text-ink">Tidemark</span>
        </div>
        <div className="rounded-card border border-border bg-surface p-6 shadow-card">
          <h1 className="mb-1 text-xl font-semibold">{title}</h1>
          {intro ? <div className="mb-5 text-sm text-ink-muted">{intro}</div> : null}
          {children}
        </div>
      </div>
    </main>
  );
}
