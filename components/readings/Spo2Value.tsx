import {
  BELOW_OXIMETER_ACCURACY_LABEL,
  belowOximeterAccuracy,
  OXIMETER_ACCURACY_NOTE,
} from "@/lib/oxygen/oximetry";

/**
 * An SpO2 value with its unit, and — below the oximeter's stated accuracy —
 * a mark in words, so a very low value is read as real but less exact.
 */
export function Spo2Value({ pct, className }: { pct: number; className?: string }) {
  return (
    <span className={className}>
      {pct} %
      {belowOximeterAccuracy(pct) ? (
        <>
          {" "}
          <span
            title={OXIMETER_ACCURACY_NOTE}
            className="rounded-full border border-border px-1.5 text-xs font-normal whitespace-nowrap text-ink-muted"
          >
            {BELOW_OXIMETER_ACCURACY_LABEL}
          </span>
        </>
      ) : null}
    </span>
  );
}
