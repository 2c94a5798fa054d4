"use client";

import { useRouter } from "next/navigation";
import { useEffect, useState } from "react";
import { Button } from "@/components/ui/Button";
import type { ActionResult } from "@/lib/action-result";
import { acknowledgeHandoffAction } from "@/lib/handoff/actions";
import type { HandoffAcknowledgeResult } from "@/lib/handoff/service";

/** Opens the browser's print dialog; the print stylesheet leaves only the sheet. */
export function PrintButton() {
  return (
    <Button variant="secondary" className="print:hidden" onClick={() => window.print()}>
      Print
    </Button>
  );
}

/** When the sheet was printed (updated as the print dialog opens), else when it was loaded. */
export function PrintedAt({ initial, timeZone }: { initial: string; timeZone: string }) {
  const [at, setAt] = useState(initial);
  useEffect(() => {
    const update = () => setAt(new Date().toISOString());
    window.addEventListener("beforeprint", update);
    return () => window.removeEventListener("beforeprint", update);
  }, []);
  const text = new Intl.DateTimeFormat("en-GB", {
    timeZone,
    day: "2-digit",
    month: "short",
    year: "numeric",
    hour: "2-digit",
    minute: "2-digit",
    hourCycle: "h23",
    timeZoneName: "short",
  }).format(new Date(at));
  return <span data-testid="printed-at">{text}</span>;
}

/**
 * Acknowledges the handoff of one bed (or several) for the named shift, then
 * reloads the sheet so it shows who acknowledged and when.
 */
export function AcknowledgeButton({
  unitId,
  shift,
  admissionIds,
  label,
  accessibleLabel,
  variant = "primary",
}: {
  unitId: number;
  /** The ISO start of the shift handed to, so a sheet left open past the change names its own handover. */
  shift: string;
  admissionIds: number[];
  label: string;
  accessibleLabel?: string;
  variant?: "primary" | "secondary";
}) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);

  async function acknowledge() {
    setBusy(true);
    setMessage(null);
    let result: ActionResult<HandoffAcknowledgeResult>;
    try {
      result = await acknowledgeHandoffAction({ unitId, shift, admissionIds });
    } catch {
      setBusy(false);
      setMessage({
        ok: false,
        text: "Tidemark could not be reached. Nothing was saved; try again.",
      });
      return;
    }
    setBusy(false);
    if (!result.ok) {
      setMessage({ ok: false, text: result.message });
      return;
    }
    const n = result.data.beds.length;
    setMessage({ ok: true, text: n === 1 ? "Acknowledged." : `${n} beds acknowledged.` });
    router.refresh();
  }

  return (
    <span className="inline-flex flex-wrap items-center gap-2 print:hidden">
      <Button variant={variant} onClick={acknowledge} disabled={busy} aria-label={accessibleLabel}>
        {busy ? "Acknowledging…" : label}
      </Button>
      <span
        role="status"
        className={`text-sm ${message?.ok === false ? "text-below" : "text-in-band"}`}
      >
        {message?.text}
      </span>
    </span>
  );
}
