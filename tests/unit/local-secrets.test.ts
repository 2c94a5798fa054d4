import { execFileSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, statSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterEach, describe, expect, it } from "vitest";

const SCRIPT = path.resolve("db/scripts/secrets.sh");
const KEYS = ["DATABASE_PASSWORD", "DATABASE_OWNER_PASSWORD", "NEXTAUTH_SECRET", "LEDGER_HMAC_KEY"];

let root: string | undefined;
afterEach(() => {
  if (root) rmSync(root, { recursive: true, force: true });
  root = undefined;
});

/** Runs the secrets helper in a throw-away project folder; returns what the shell then sees. */
function run(dir: string, env: Record<string, string> = {}): Record<string, string> {
  const out = execFileSync(
    "bash",
    [
      "-c",
      `set -euo pipefail; ROOT="$1"; source "${SCRIPT}"; ensure_local_env; load_local_env; env`,
      "_",
      dir,
    ],
    {
      env: { PATH: process.env.PATH ?? "", NODE_ENV: "test", ...env },
      encoding: "utf8",
      stdio: ["ignore", "pipe", "pipe"],
    },
  );
  return Object.fromEntries(
    out.split("\n").flatMap((line) => {
      const at = line.indexOf("=");
      return at > 0 ? [[line.slice(0, at), line.slice(at + 1)]] : [];
    }),
  );
}

function fileValues(dir: string): Record<string, string> {
  return Object.fromEntries(
    readFileSync(path.join(dir, ".env.local"), "utf8")
      .split("\n")
      .filter((l) => /^[A-Z_]+=/.test(l))
      .map((l) => [l.slice(0, l.indexOf("=")), l.slice(l.indexOf("=") + 1)]),
  );
}

describe("secrets per install (.env.local)", () => {
  it("generates four distinct 32-byte base64url secrets, private to the owner, and exports them", () => {
    root = mkdtempSync(path.join(tmpdir(), "tidemark-secrets-"));
    const seen = run(root);
    const file = fileValues(root);
    for (const key of KEYS) {
      expect(file[key], key).toMatch(/^[A-Za-z0-9_-]{43}$/);
      expect(seen[key], key).toBe(file[key]);
    }
    expect(new Set(KEYS.map((k) => file[k])).size).toBe(4);
    expect(statSync(path.join(root, ".env.local")).mode & 0o077).toBe(0);
  });

  it("reuses them on every later run and fills in only what is missing", () => {
    root = mkdtempSync(path.join(tmpdir(), "tidemark-secrets-"));
    run(root);
    const first = fileValues(root);
    run(root);
    expect(fileValues(root)).toEqual(first);
    const withoutLedgerKey = readFileSync(path.join(root, ".env.local"), "utf8").replace(
      /^LEDGER_HMAC_KEY=.*\n/m,
      "",
    );
    writeFileSync(path.join(root, ".env.local"), withoutLedgerKey);
    const again = fileValues(root);
    run(root);
    const after = fileValues(root);
    expect(after.DATABASE_PASSWORD).toBe(again.DATABASE_PASSWORD);
    expect(after.LEDGER_HMAC_KEY).toMatch(/^[A-Za-z0-9_-]{43}$/);
    expect(after.LEDGER_HMAC_KEY).not.toBe(first.LEDGER_HMAC_KEY);
  });

  it("lets a variable set in the environment win over the file", () => {
    root = mkdtempSync(path.join(tmpdir(), "tidemark-secrets-"));
    const seen = run(root, { DATABASE_PASSWORD: "set-by-the-operator" });
    expect(seen.DATABASE_PASSWORD).toBe("set-by-the-operator");
    expect(fileValues(root).DATABASE_PASSWORD).not.toBe("set-by-the-operator");
  });
});
