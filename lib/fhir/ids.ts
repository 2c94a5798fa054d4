import { createHash } from "node:crypto";

/** RFC 4122 §4.3 name space for URLs (6ba7b811-9dad-11d1-80b4-00c04fd430c8). */
const URL_NAMESPACE = Buffer.from("6ba7b8119dad11d180b400c04fd430c8", "hex");

/**
 * A name-based (version 5, SHA-1) UUID, RFC 4122 §4.3: the same name always
 * gives the same UUID, so a record keeps its fullUrl from one export to the next.
 */
export function uuidV5(name: string, namespace: Buffer = URL_NAMESPACE): string {
  const hash = createHash("sha1").update(namespace).update(name, "utf8").digest();
  const bytes = hash.subarray(0, 16);
  bytes[6] = (bytes[6]! & 0x0f) | 0x50;
  bytes[8] = (bytes[8]! & 0x3f) | 0x80;
  const hex = bytes.toString("hex");
  return `${hex.slice(0, 8)}-${hex.slice(8, 12)}-${hex.slice(12, 16)}-${hex.slice(16, 20)}-${hex.slice(20)}`;
}

/**
 * The bundle fullUrl of one exported resource: `urn:uuid:` over the
 * installation's address, the resource type and its id, so two installations
 * do not mint the same UUID for their own "reading-1".
 */
export function resourceFullUrl(installation: string, resourceType: string, id: string): string {
  return `urn:uuid:${uuidV5(`${installation.replace(/\/+$/, "")}/fhir/${resourceType}/${id}`)}`;
}
