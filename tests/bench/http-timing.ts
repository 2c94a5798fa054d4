import http from "node:http";
import type { AddressInfo } from "node:net";

/** The q-quantile of sorted samples (nearest rank, lower). */
export function quantile(sorted: number[], q: number): number {
  return sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))] ?? NaN;
}

/** A loopback node:http server answering every GET with `handler()` as JSON. */
export async function serve(
  handler: () => Promise<unknown>,
): Promise<{ url: string; close: () => Promise<void> }> {
  const server = http.createServer((_req, res) => {
    handler()
      .then((body) => {
        res.writeHead(200, { "Content-Type": "application/json" });
        res.end(JSON.stringify(body));
      })
      .catch((error: unknown) => {
        res.writeHead(500);
        res.end(String(error));
      });
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const { port } = server.address() as AddressInfo;
  return {
    url: `http://127.0.0.1:${port}/`,
    close: () => new Promise((resolve) => server.close(() => resolve())),
  };
}

/** One keep-alive connection, so requests are timed one after another. */
export const agent = new http.Agent({ keepAlive: true, maxSockets: 1 });

/** Milliseconds until the whole answer has arrived; rejects on a non-200. */
export function get(url: string): Promise<number> {
  return new Promise((resolve, reject) => {
    const start = performance.now();
    http
      .get(url, { agent }, (res) => {
        res.resume();
        res.on("end", () =>
          res.statusCode === 200
            ? resolve(performance.now() - start)
            : reject(new Error(`HTTP ${res.statusCode}`)),
        );
      })
      .on("error", reject);
  });
}
