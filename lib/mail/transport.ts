import nodemailer, { type Transporter } from "nodemailer";
import type SMTPTransport from "nodemailer/lib/smtp-transport";
import { getEnv } from "../env";
import { isLoopbackHost } from "./loopback";

export type MailTransporter = Transporter<SMTPTransport.SentMessageInfo, SMTPTransport.Options>;

/**
 * A relay that is down or unreachable fails the send within this, rather than
 * hanging a worker — and well within the worker's claim on the e-mail
 * (OUTBOX_CLAIM_SECONDS), so a slow send never outlives its claim and is sent
 * again by another worker at the same time.
 */
function timeoutMs(): number {
  return Math.min(10_000, (getEnv().OUTBOX_CLAIM_SECONDS * 1000) / 4);
}

/**
 * An SMTP transporter for one relay. On loopback (the local fake inbox) it
 * speaks plain SMTP; anywhere else it insists on TLS, either from the first
 * byte (`secure`, port 465) or through STARTTLS, so alert e-mails and relay
 * credentials never cross a network in clear. One connection per message, no
 * pool: alert mail is rare and a pool would hold sockets to a relay that restarts.
 */
export function createMailTransport(opts: {
  host: string;
  port: number;
  secure?: boolean;
  user?: string;
  pass?: string;
}): MailTransporter {
  const secure = opts.secure ?? false;
  const loopback = isLoopbackHost(opts.host);
  // Typed as the plain SMTP transport: no `pool` option means one connection per message.
  const options: SMTPTransport.Options = {
    host: opts.host,
    port: opts.port,
    secure,
    ignoreTLS: !secure && loopback,
    requireTLS: !secure && !loopback,
    auth: opts.user ? { user: opts.user, pass: opts.pass ?? "" } : undefined,
    connectionTimeout: timeoutMs(),
    greetingTimeout: timeoutMs(),
    socketTimeout: timeoutMs(),
  };
  return nodemailer.createTransport(options);
}

let cached: MailTransporter | undefined;

/** The process's transporter for the relay named by SMTP_* (the local fake by default). */
export function mailTransport(): MailTransporter {
  if (!cached) {
    const env = getEnv();
    cached = createMailTransport({
      host: env.SMTP_HOST,
      port: env.SMTP_PORT,
      secure: env.SMTP_SECURE === "1",
      user: env.SMTP_USER || undefined,
      pass: env.SMTP_PASS || undefined,
    });
  }
  return cached;
}
