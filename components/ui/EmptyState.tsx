import type { ReactNode } from "react";
import { IconInfo } from "./icons";

export function EmptyState({ title, children }: { title: string; children?: ReactNode }) {
  return (
    <div className="flex flex-col items-center gap-2 rounded-card border border-dashed border-border-strong bg-surface px-6 py-10 text-center">
      <IconInfo className="text-2xl text-ink-muted" />
      <p className="text-lg font-semibold">{title}</p>
      {children ? <div className="max-w-prose text-sm text-ink-muted">{children}</div> : null}
    </div>
  );
}
