import { DomainError } from "../errors";

export { readBodyBytes } from "../http";

/** `?partial=accept` imports the good rows of a file with rejected rows; anything else refuses it whole. */
export function partialAccepted(value: string | null): boolean {
  if (value === null || value === "") return false;
  if (value === "accept") return true;
  throw new DomainError("partial must be 'accept' or left out.", 400, {
    partial: ["partial must be 'accept' or left out."],
  });
}
