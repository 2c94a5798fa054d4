import { ApiRequestError, getApiJson } from "@/components/ui/api-json";

/** The ledger's name for the shared API error. */
export { ApiRequestError as LedgerRequestError };

/** GETs JSON from /api/v1 for the ledger's SWR hooks. */
export function getLedgerJson<T>(url: string): Promise<T> {
  return getApiJson<T>(url, "the ledger");
}
