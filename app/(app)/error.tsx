"use client";

import { Button } from "@/components/ui/Button";
import { IconWarning } from "@/components/ui/icons";

export default function AppError({ reset }: { error: Error; reset: () => void }) {
  return (
    <div
      role="alert"
      className="mx-auto flex max-w-md flex-col items-center gap-3 py-16 text-center"
    >
      <IconWarning className="text-3xl text-below" />
      <h1 className="text-xl font-semibold">This page could not be loaded</h1>
      <p className="text-sm text-ink-muted">
        Nothing you entered was lost on the server. Try again; if it keeps failing, tell the unit's
        administrator what you were doing.
      </p>
      <Button onClick={reset}>Try again</Button>
    </div>
  );
}
