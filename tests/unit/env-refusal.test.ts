import { afterEach, describe, expect, it, vi } from "vitest";
import {
  DEMO_APP_PASSWORD,
  DEMO_OWNER_PASSWORD,
  DEMO_SECRET,
  isLoopbackUrl,
  parseEnv,
} from "@/lib/env";

const REAL = {
  NEXTAUTH_SECRET: "a".repeat(43),
  DATABASE_PASSWORD: "generated-app-password",
  DATABASE_OWNER_PASSWORD: "generated-owner-password",
  LEDGER_HMAC_KEY: "b".repeat(43),
};
const OFF_LOOPBACK = "https://tidemark.hospital.example";

function refusal(source: Record<string, string>): string {
  try {
    parseEnv(source);
  } catch (error) {
    return (error as Error).message;
  }
  throw new Error("expected the environment to be refused");
}

describe("loopback addresses", () => {
  it("counts localhost, 127.0.0.0/8 and ::1 as this machine", () => {
    for (const url of [
      "http://localhost:3000",
      "http://127.0.0.1:3100",
      "http://[::1]:3000",
      "http://127.1.2.3",
    ]) {
      expect(isLoopbackUrl(url), url).toBe(true);
    }
  });
  it("does not count names that only start like it", () => {
    for (const url of [
      OFF_LOOPBACK,
      "http://localhost.evil.example",
      "http://127.0.0.1.nip.io",
      "http://10.0.0.5:3000",
    ]) {
      expect(isLoopbackUrl(url), url).toBe(false);
    }
  });
});

describe("demo secrets off loopback", () => {
  it("refuses the demo session secret even with TIDEMARK_DEMO=1 outside production", () => {
    const message = refusal({
      ...REAL,
      NEXTAUTH_SECRET: DEMO_SECRET,
      NEXTAUTH_URL: OFF_LOOPBACK,
      TIDEMARK_DEMO: "1",
      NODE_ENV: "development",
    });
    expect(message).toMatch(/NEXTAUTH_SECRET: the documented demo value is refused/);
    expect(message).not.toMatch(/DATABASE_PASSWORD/);
  });

  it("refuses the documented database passwords, explicit or defaulted, each by name", () => {
    const explicit = refusal({
      NEXTAUTH_SECRET: REAL.NEXTAUTH_SECRET,
      DATABASE_PASSWORD: DEMO_APP_PASSWORD,
      DATABASE_OWNER_PASSWORD: DEMO_OWNER_PASSWORD,
      NEXTAUTH_URL: OFF_LOOPBACK,
    });
    expect(explicit).toMatch(/DATABASE_PASSWORD: the documented demo value/);
    expect(explicit).toMatch(/DATABASE_OWNER_PASSWORD: the documented demo value/);
    const defaulted = refusal({ NODE_ENV: "production", NEXTAUTH_URL: OFF_LOOPBACK });
    for (const name of [
      "NEXTAUTH_SECRET",
      "DATABASE_PASSWORD",
      "DATABASE_OWNER_PASSWORD",
      "LEDGER_HMAC_KEY",
    ]) {
      expect(defaulted).toMatch(new RegExp(`${name}: the documented demo value`));
    }
  });

  it("accepts the install's own secrets off loopback in production", () => {
    const env = parseEnv({ ...REAL, NODE_ENV: "production", NEXTAUTH_URL: OFF_LOOPBACK });
    expect(env.NEXTAUTH_SECRET).toBe(REAL.NEXTAUTH_SECRET);
  });

  it("keeps the demo values usable on this machine", () => {
    for (const url of ["http://localhost:3000", "http://127.0.0.1:3100", "http://[::1]:3000"]) {
      const env = parseEnv({ NEXTAUTH_URL: url, NODE_ENV: "development" });
      expect(env.DATABASE_PASSWORD).toBe(DEMO_APP_PASSWORD);
      expect(env.NEXTAUTH_SECRET).toBe(DEMO_SECRET);
    }
  });

  it("still refuses the demo secret in a production build on loopback unless TIDEMARK_DEMO=1", () => {
    expect(refusal({ NODE_ENV: "production", NEXTAUTH_URL: "http://localhost:3000" })).toMatch(
      /NEXTAUTH_SECRET: set a real NEXTAUTH_SECRET in production/,
    );
    expect(() =>
      parseEnv({
        NODE_ENV: "production",
        NEXTAUTH_URL: "http://localhost:3000",
        TIDEMARK_DEMO: "1",
      }),
    ).not.toThrow();
  });
});

describe("check at server start", () => {
  afterEach(() => {
    vi.unstubAllEnvs();
    vi.restoreAllMocks();
    vi.resetModules();
  });

  it("exits with the reason when the configuration is refused", async () => {
    vi.stubEnv("NEXTAUTH_URL", OFF_LOOPBACK);
    vi.stubEnv("NEXTAUTH_SECRET", DEMO_SECRET);
    const exit = vi.spyOn(process, "exit").mockImplementation((() => undefined) as never);
    const error = vi.spyOn(console, "error").mockImplementation(() => undefined);
    const { checkEnvAtStart } = await import("@/lib/start-check");
    checkEnvAtStart();
    expect(exit).toHaveBeenCalledWith(1);
    expect(String(error.mock.calls[0]?.[0])).toMatch(/Tidemark will not start: .*NEXTAUTH_SECRET/s);
  });

  it("lets a good configuration through", async () => {
    vi.stubEnv("NEXTAUTH_URL", OFF_LOOPBACK);
    for (const [key, value] of Object.entries(REAL)) vi.stubEnv(key, value);
    const exit = vi.spyOn(process, "exit").mockImplementation((() => undefined) as never);
    const { checkEnvAtStart } = await import("@/lib/start-check");
    checkEnvAtStart();
    expect(exit).not.toHaveBeenCalled();
  });
});
