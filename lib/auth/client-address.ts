import { isIP } from "node:net";

/**
 * The client's address for throttling sign-in. Next.js fills
 * X-Forwarded-For with the socket's address only when the request carries
 * none, so the header is the only source — and every hop a client controls
 * can be forged. The address is therefore read right to left: hops that are
 * one of the configured trusted proxies are skipped, and the first other hop
 * is the client. With no trusted proxies, that is the right-most entry (the
 * socket's address when the client sent no header).
 *
 * Bounded and validated: a header with more than {@link MAX_HOPS} entries, or
 * whose chosen entry is not an IP address, yields "invalid" — one shared
 * bucket, so a malformed header never dodges the address throttle and never
 * reaches the database unchecked.
 */
export const MAX_HOPS = 20;
export const INVALID_ADDRESS = "invalid";

export function parseTrustedProxies(list: string): Set<string> {
  return new Set(
    list
      .split(",")
      .map((p) => normalise(p.trim()))
      .filter((p): p is string => p !== null),
  );
}

function normalise(value: string): string | null {
  // "::ffff:10.0.0.1" (IPv4 mapped into IPv6) is the same client as "10.0.0.1".
  const v = value.toLowerCase().replace(/^::ffff:(\d+\.\d+\.\d+\.\d+)$/, "$1");
  return isIP(v) ? v : null;
}

export function clientAddress(
  forwardedFor: string | undefined | null,
  trusted: Set<string>,
): string {
  if (!forwardedFor) return "local";
  if (forwardedFor.length > MAX_HOPS * 46) return INVALID_ADDRESS;
  const hops = forwardedFor.split(",").map((h) => h.trim());
  if (hops.length > MAX_HOPS) return INVALID_ADDRESS;
  for (let i = hops.length - 1; i >= 0; i--) {
    const hop = normalise(hops[i]!);
    if (hop === null) return INVALID_ADDRESS;
    if (!trusted.has(hop)) return hop;
  }
  // Every hop was a trusted proxy: the left-most is as close to the client as we know.
  return normalise(hops[0]!) ?? INVALID_ADDRESS;
}
