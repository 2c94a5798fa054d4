import { getEnv } from "./env";

/** Parses the environment once at server start; on error says why and exits. */
export function checkEnvAtStart(): void {
  try {
    getEnv();
  } catch (error) {
    const reason = error instanceof Error ? error.message : String(error);
    console.error(`Tidemark will not start: ${reason}`);
    process.exit(1);
  }
}
