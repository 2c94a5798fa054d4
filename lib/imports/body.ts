import { DomainError } from "../errors";

/**
 * Reads a request body as bytes, chunk by chunk, refusing it (413) as soon as
 * it passes `maxBytes` rather than after buffering all of it.
 */
export async function readBodyBytes(request: Request, maxBytes: number): Promise<Buffer> {
  if (!request.body) return Buffer.alloc(0);
  const declared = Number(request.headers.get("content-length") ?? "0");
  if (declared > maxBytes) throw new DomainError(`The body is larger than ${Math.round(maxBytes / 1024 / 1024)} MB.`, 413);
  const chunks: Buffer[] = [];
  let size = 0;
  const reader = request.body.getReader();
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    if (size > maxBytes) {
      await reader.cancel();
      throw new DomainError(`The body is larger than ${Math.round(maxBytes / 1024 / 1024)} MB.`, 413);
    }
    chunks.push(Buffer.from(value));
  }
  return Buffer.concat(chunks, size);
}

/** `?partial=accept` imports the good rows of a file with rejected rows; anything else refuses it whole. */
export function partialAccepted(value: string | null): boolean {
  if (value === null || value === "") return false;
  if (value === "accept") return true;
  throw new DomainError("partial must be 'accept' or left out.", 400, { partial: ["partial must be 'accept' or left out."] });
}
