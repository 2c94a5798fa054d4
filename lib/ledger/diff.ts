/** One field of a ledger row's before/after, flattened to a dotted path. */
export type FieldChange = {
  field: string;
  before: string | undefined;
  after: string | undefined;
  changed: boolean;
};

function parse(stored: string | null): unknown {
  if (stored === null) return undefined;
  try {
    return JSON.parse(stored) as unknown;
  } catch {
    return stored;
  }
}

function show(value: unknown): string {
  if (value === null) return "—";
  return typeof value === "string" ? value : JSON.stringify(value);
}

/** Leaves of a JSON value by dotted path ("limits.fio2Max", "steps.2.peep"); a scalar at the top is "value". */
function flatten(value: unknown, prefix: string, out: Map<string, string>): void {
  if (value !== null && typeof value === "object") {
    const entries = Array.isArray(value)
      ? value.map((v, i) => [String(i), v] as const)
      : Object.entries(value as Record<string, unknown>);
    if (entries.length === 0) out.set(prefix || "value", Array.isArray(value) ? "[]" : "{}");
    for (const [k, v] of entries) flatten(v, prefix ? `${prefix}.${k}` : k, out);
    return;
  }
  if (value !== undefined) out.set(prefix || "value", show(value));
}

/**
 * A ledger row's before and after as a field-by-field difference, in the order
 * the fields first appear (before's, then after's new ones); unchanged fields
 * are kept and marked, so the whole record can still be read. A field only in
 * `after` was added, only in `before` was removed.
 */
export function ledgerDiff(before: string | null, after: string | null): FieldChange[] {
  const b = new Map<string, string>();
  const a = new Map<string, string>();
  flatten(parse(before), "", b);
  flatten(parse(after), "", a);
  const fields = [...new Set([...b.keys(), ...a.keys()])];
  return fields.map((field) => ({
    field,
    before: b.get(field),
    after: a.get(field),
    changed: b.get(field) !== a.get(field),
  }));
}
