// Next calls register() once when a server starts (never during `next build`,
// which therefore needs no secrets). A bad configuration stops the server here
// instead of failing every request.
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME === "nodejs") {
    const { checkEnvAtStart } = await import("./lib/start-check");
    checkEnvAtStart();
  }
}
