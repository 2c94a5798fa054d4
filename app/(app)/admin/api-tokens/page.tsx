import type { Metadata } from "next";
import { ApiTokenForm } from "@/components/api-tokens/ApiTokenForm";
import { ApiTokensTable } from "@/components/api-tokens/ApiTokensTable";
import { listApiTokens } from "@/lib/api-tokens/queries";
import { pagePermission } from "@/lib/auth/page-guard";
import { db } from "@/lib/db";
import { listUnits } from "@/lib/units/queries";

export const metadata: Metadata = { title: "API tokens" };

export default async function ApiTokensPage() {
  await pagePermission("api_token.manage");
  const [tokens, units] = await Promise.all([listApiTokens(db()), listUnits(db())]);
  return (
    <div className="space-y-6">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">API tokens</h1>
        <p className="max-w-prose text-sm text-ink-muted">
          Tokens let interface engines send HL7 results and monitor files to{" "}
          <code className="font-mono text-xs">/api/v1/imports/hl7</code> and{" "}
          <code className="font-mono text-xs">/api/v1/imports/monitor</code> (write tokens), and
          read a patient&apos;s FHIR R4 export from{" "}
          <code className="font-mono text-xs">/api/v1/patients/&#123;id&#125;/fhir</code> (any
          token). Each is limited to its units and to reading or writing, is shown once when
          created, expires after the days you choose (a year unless you choose otherwise, at most
          two), and can be revoked at any time. Creating and revoking are written to the ledger, by
          name and never with any part of the token.
        </p>
      </div>
      <ApiTokenForm units={units.map((u) => ({ id: u.id, label: `${u.code} · ${u.name}` }))} />
      <ApiTokensTable tokens={tokens} />
    </div>
  );
}
