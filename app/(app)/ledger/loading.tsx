import { LedgerLoading } from "@/components/ledger/LedgerView";

export default function LedgerPageLoading() {
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-semibold tracking-tight">Ledger</h1>
      <LedgerLoading />
    </div>
  );
}
