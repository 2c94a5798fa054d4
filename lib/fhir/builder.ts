import type * as fhir4 from "fhir/r4";
import { resourceFullUrl } from "./ids";

/** Builds the bundle's resources and the references between them. */
export class BundleBuilder {
  readonly entries: fhir4.BundleEntry[] = [];
  private readonly fullUrls = new Map<string, string>();

  constructor(private readonly installation: string) {}

  fullUrl(resourceType: string, id: string): string {
    const key = `${resourceType}/${id}`;
    let url = this.fullUrls.get(key);
    if (!url) {
      url = resourceFullUrl(this.installation, resourceType, id);
      this.fullUrls.set(key, url);
    }
    return url;
  }

  ref(resourceType: string, id: string): fhir4.Reference {
    return { reference: this.fullUrl(resourceType, id) };
  }

  add(resource: fhir4.FhirResource & { id: string }): void {
    this.entries.push({ fullUrl: this.fullUrl(resource.resourceType, resource.id), resource });
  }
}
