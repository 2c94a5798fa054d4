"use client";

import { Button } from "@/components/ui/Button";

/** Opens the browser's print dialog; the print stylesheet keeps the report and heads each sheet. */
export function PrintButton() {
  return (
    <Button variant="secondary" className="print:hidden" onClick={() => window.print()}>
      Print or save as PDF
    </Button>
  );
}
