import { isIP } from "node:net";

/**
 * True for names and addresses that never leave this machine: `localhost`,
 * 127.0.0.0/8 and ::1. The fake inbox has no authentication, so it may only
 * listen on these; the transport skips TLS only for these.
 */
export function isLoopbackHost(host: string): boolean {
  const h = host
    .trim()
    .toLowerCase()
    .replace(/^\[(.*)\]$/, "$1");
  if (h === "localhost") return true;
  if (isIP(h) === 4) return h.startsWith("127.");
  if (isIP(h) === 6) return h === "::1" || h === "0:0:0:0:0:0:0:1";
  return false;
}
