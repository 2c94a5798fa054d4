import mysql from "mysql2/promise";
import { describe, expect, it } from "vitest";
import { DEMO_APP_PASSWORD, DEMO_OWNER_PASSWORD, getEnv } from "@/lib/env";

// What an attacker on the same machine could try against the private MariaDB.

function connect(user: string, password: string) {
  const env = getEnv();
  return mysql.createConnection({
    host: env.DATABASE_HOST,
    port: env.DATABASE_PORT,
    user,
    password,
    database: user === "root" ? undefined : env.DATABASE_NAME,
    connectTimeout: 5000,
  });
}

async function withAccount<T>(
  role: "app" | "owner",
  run: (c: mysql.Connection) => Promise<T>,
): Promise<T> {
  const env = getEnv();
  const connection =
    role === "app"
      ? await connect(env.DATABASE_USER, env.DATABASE_PASSWORD)
      : await connect(env.DATABASE_OWNER_USER, env.DATABASE_OWNER_PASSWORD);
  try {
    return await run(connection);
  } finally {
    await connection.end();
  }
}

async function refusal(attempt: Promise<unknown>): Promise<string | undefined> {
  try {
    const connection = await attempt;
    if (connection && typeof (connection as mysql.Connection).end === "function") {
      await (connection as mysql.Connection).end();
    }
    return undefined;
  } catch (error) {
    return (error as { code?: string }).code;
  }
}

describe("private MariaDB hardening", () => {
  it("refuses root over TCP without a password", async () => {
    // 1045, or 1698 when the server knows the name only with socket authentication.
    expect(await refusal(connect("root", ""))).toMatch(
      /^ER_ACCESS_DENIED_(ERROR|NO_PASSWORD_ERROR)$/,
    );
  });

  it("no longer accepts the passwords earlier versions published", async () => {
    const env = getEnv();
    expect(env.DATABASE_PASSWORD).not.toBe(DEMO_APP_PASSWORD);
    expect(env.DATABASE_OWNER_PASSWORD).not.toBe(DEMO_OWNER_PASSWORD);
    expect(await refusal(connect(env.DATABASE_USER, DEMO_APP_PASSWORD))).toBe(
      "ER_ACCESS_DENIED_ERROR",
    );
    expect(await refusal(connect(env.DATABASE_OWNER_USER, DEMO_OWNER_PASSWORD))).toBe(
      "ER_ACCESS_DENIED_ERROR",
    );
  });

  it("confines server-side file access to a folder of its own and turns LOAD DATA LOCAL off", async () => {
    const [rows] = await withAccount("app", (c) =>
      c.query("SELECT @@secure_file_priv AS priv, @@local_infile AS localInfile"),
    );
    const { priv, localInfile } = (rows as { priv: string | null; localInfile: number }[])[0]!;
    expect(priv).toMatch(/^\/.+/);
    expect(localInfile).toBe(0);
  });

  for (const role of ["app", "owner"] as const) {
    it(`does not let the ${role} account read or write files on the server`, async () => {
      await withAccount(role, async (c) => {
        let content: unknown = null;
        try {
          const [rows] = await c.query("SELECT LOAD_FILE('/etc/hostname') AS content");
          content = (rows as { content: unknown }[])[0]?.content;
        } catch (error) {
          expect((error as { code?: string }).code).toMatch(/DENIED|PRIV/);
        }
        expect(content).toBeNull();
        const outfile = `/tmp/tidemark-outfile-${process.pid}-${role}`;
        await expect(c.query(`SELECT 1 INTO OUTFILE '${outfile}'`)).rejects.toMatchObject({
          code: expect.stringMatching(/DENIED|PRIV|OPTION_PREVENTS/) as unknown as string,
        });
      });
    });
  }
});
