// `npm run mail:inbox` (and `npm run demo`, in the background): the local SMTP
// fake on 127.0.0.1 at SMTP_PORT, with its readable inbox at MAIL_INBOX_PORT.
import "../../lib/local-env";
import { getEnv } from "../../lib/env";
import { startFakeInbox } from "../../lib/mail/fake-inbox";

const HOST = "127.0.0.1";

async function main(): Promise<void> {
  const env = getEnv();
  const url = `http://${HOST}:${env.MAIL_INBOX_PORT}`;
  const smtp = `${HOST}:${env.SMTP_PORT}`;
  try {
    const inbox = await startFakeInbox({
      host: HOST,
      smtpPort: env.SMTP_PORT,
      httpPort: env.MAIL_INBOX_PORT,
    });
    console.log(`Mail inbox (local SMTP fake): ${url}  (SMTP ${smtp})`);
    const stop = () => {
      inbox.stop().then(
        () => process.exit(0),
        () => process.exit(1),
      );
    };
    process.once("SIGINT", stop);
    process.once("SIGTERM", stop);
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== "EADDRINUSE") throw err;
    // An inbox from an earlier run still serves: reuse it rather than fail.
    if (await inboxAnswers(url)) {
      console.log(`Mail inbox already running: ${url}  (SMTP ${smtp})`);
      return;
    }
    console.error(
      `Port ${env.SMTP_PORT} or ${env.MAIL_INBOX_PORT} is in use by another program; ` +
        "stop it or set SMTP_PORT and MAIL_INBOX_PORT to free ports.",
    );
    process.exitCode = 1;
  }
}

async function inboxAnswers(url: string): Promise<boolean> {
  try {
    const res = await fetch(`${url}/api/messages`, { signal: AbortSignal.timeout(2_000) });
    return res.ok && Array.isArray(await res.json());
  } catch {
    return false;
  }
}

main().catch((err: unknown) => {
  console.error(err);
  process.exit(1);
});
