import { describe, expect, it } from "vitest";
import { resourceFullUrl, uuidV5 } from "@/lib/fhir/ids";

// Expected values computed with Python's standard library (uuid.uuid5), an
// implementation independent of this one.
const DNS_NAMESPACE = Buffer.from("6ba7b8109dad11d180b400c04fd430c8", "hex");

describe("name-based UUIDs for bundle fullUrls", () => {
  it("matches RFC 4122 version 5 in the DNS name space", () => {
    expect(uuidV5("www.example.com", DNS_NAMESPACE)).toBe("2ed6657d-e927-568b-95e1-2665a8aea6a2");
  });

  it("matches RFC 4122 version 5 in the URL name space", () => {
    expect(uuidV5("http://localhost:3000/fhir/Patient/patient-1")).toBe(
      "93aef964-20ed-5835-b5b1-c57a7ce6dd17",
    );
  });

  it("names a resource by installation, type and id, ignoring a trailing slash", () => {
    const url = resourceFullUrl("http://localhost:3000/", "Patient", "patient-1");
    expect(url).toBe("urn:uuid:93aef964-20ed-5835-b5b1-c57a7ce6dd17");
    expect(resourceFullUrl("http://localhost:3000", "Observation", "patient-1")).not.toBe(url);
  });
});
