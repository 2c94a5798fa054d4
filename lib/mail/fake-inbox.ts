import { randomUUID } from "node:crypto";
import { createServer, type IncomingMessage, type Server, type ServerResponse } from "node:http";
import type { Server as NetServer, Socket } from "node:net";
import { simpleParser, type ParsedMail } from "mailparser";
import { SMTPServer, type SMTPServerSession } from "smtp-server";
import { isLoopbackHost } from "./loopback";

// A local SMTP fake for the demo and the tests: it accepts every message over
// real SMTP, parses it and keeps it in memory, and can show the inbox over HTTP.
// Production points SMTP_HOST at a real relay instead (lib/mail/transport.ts).

/** One received message, as the inbox shows it and as tests assert on it. */
export type InboxMessage = {
  id: string;
  /** The Message-ID header with its angle brackets, e.g. `<t-1@tidemark.test>`. */
  messageId: string;
  /** The From header, decoded, as `Name <address>` (or the envelope sender when it has none). */
  from: string;
  /** The envelope recipients (RCPT TO): who the message was delivered to, Bcc included. */
  to: string[];
  subject: string;
  text: string;
  html: string;
  receivedAt: string;
  /** Header name (lower case) → raw value, unfolded; repeated headers joined by newlines. */
  headers: Record<string, string>;
};

export type FakeInbox = {
  host: string;
  smtpPort: number;
  httpPort: number | null;
  /** The kept messages in arrival order (oldest first), as copies. */
  messages(): InboxMessage[];
  clear(): void;
  stop(): Promise<void>;
};

/** Enough for a long alert digest; the oldest are dropped beyond it. */
const MAX_MESSAGES = 500;
/** Advertised as SIZE; larger messages are refused with 552. */
const MAX_MESSAGE_BYTES = 5 * 1024 * 1024;

/**
 * Starts the fake on loopback: SMTP without authentication or STARTTLS and,
 * unless `httpPort` is null, the readable inbox over HTTP. Port 0 picks a free
 * port; the returned ports are the real ones. Rejects (with EADDRINUSE…) when a
 * port cannot be taken, leaving nothing open.
 */
export async function startFakeInbox(
  opts: { host?: string; smtpPort?: number; httpPort?: number | null } = {},
): Promise<FakeInbox> {
  const host = opts.host ?? "127.0.0.1";
  // No authentication and an open inbox page: never reachable from another machine.
  if (!isLoopbackHost(host)) {
    throw new Error(`The fake inbox listens on loopback only, not on ${host}`);
  }
  let stored: InboxMessage[] = [];

  const smtp = new SMTPServer({
    disabledCommands: ["AUTH", "STARTTLS"],
    size: MAX_MESSAGE_BYTES,
    rejectOversized: true,
    banner: "Tidemark fake inbox (local, not a relay)",
    logger: false,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      let bytes = 0;
      stream.on("data", (chunk: Buffer) => {
        bytes += chunk.length;
        if (bytes <= MAX_MESSAGE_BYTES) chunks.push(chunk);
      });
      stream.on("end", () => {
        if (stream.sizeExceeded) {
          callback(smtpError(552, `Message exceeds ${MAX_MESSAGE_BYTES} bytes`));
          return;
        }
        // Stored before the reply, so a send that resolved is already in the inbox.
        simpleParser(Buffer.concat(chunks)).then(
          (parsed) => {
            stored.push(toInboxMessage(parsed, session));
            if (stored.length > MAX_MESSAGES) stored = stored.slice(-MAX_MESSAGES);
            callback(null, "Stored in the fake inbox");
          },
          (err: unknown) => {
            callback(smtpError(554, `Unreadable message: ${String(err)}`));
          },
        );
      });
    },
  });
  // Client resets and timeouts are reported here; a fake has nothing to do about them.
  smtp.on("error", () => {});
  const smtpSockets = trackSockets(smtp.server);

  const smtpPort = await listen(smtp.server, opts.smtpPort ?? 0, host);

  let http: Server | null = null;
  let httpPort: number | null = null;
  if (opts.httpPort !== null) {
    http = createServer((req, res) => {
      serveInbox(
        req,
        res,
        () => stored,
        () => (stored = []),
        `${host}:${smtpPort}`,
      );
    });
    try {
      httpPort = await listen(http, opts.httpPort ?? 0, host);
    } catch (err) {
      await closeSmtp(smtp, smtpSockets);
      throw err;
    }
  }

  let stopping: Promise<void> | null = null;
  return {
    host,
    smtpPort,
    httpPort,
    messages: () => stored.map((m) => ({ ...m, to: [...m.to], headers: { ...m.headers } })),
    clear: () => {
      stored = [];
    },
    stop: () => {
      stopping ??= Promise.all([
        closeSmtp(smtp, smtpSockets),
        http ? closeHttp(http) : Promise.resolve(),
      ]).then(() => undefined);
      return stopping;
    },
  };
}

function smtpError(responseCode: number, message: string): Error {
  return Object.assign(new Error(message), { responseCode });
}

function toInboxMessage(parsed: ParsedMail, session: SMTPServerSession): InboxMessage {
  const headers: Record<string, string> = {};
  for (const { key, line } of parsed.headerLines) {
    const value = line
      .slice(line.indexOf(":") + 1)
      .replace(/\r?\n[ \t]+/g, " ")
      .trim();
    headers[key] = key in headers ? `${headers[key]}\n${value}` : value;
  }
  const mailFrom = session.envelope.mailFrom;
  return {
    id: randomUUID(),
    messageId: parsed.messageId ?? "",
    from: parsed.from
      ? parsed.from.value
          .map((a) => (a.name ? `${a.name} <${a.address ?? ""}>` : (a.address ?? "")))
          .join(", ")
      : mailFrom
        ? mailFrom.address
        : "",
    to: session.envelope.rcptTo.map((r) => r.address),
    subject: parsed.subject ?? "",
    text: parsed.text ?? "",
    html: typeof parsed.html === "string" ? parsed.html : "",
    receivedAt: new Date().toISOString(),
    headers,
  };
}

// Open sockets are destroyed on stop, so stop never waits for a client to leave.
function trackSockets(server: NetServer): Set<Socket> {
  const sockets = new Set<Socket>();
  server.on("connection", (socket) => {
    sockets.add(socket);
    socket.once("close", () => sockets.delete(socket));
  });
  return sockets;
}

function listen(server: NetServer, port: number, host: string): Promise<number> {
  return new Promise((resolve, reject) => {
    const onError = (err: Error) => reject(err);
    server.once("error", onError);
    // exclusive: never share a port through the cluster module; the address is
    // reusable at once after stop (Node sets SO_REUSEADDR), which the tests rely on.
    server.listen({ port, host, exclusive: true }, () => {
      server.off("error", onError);
      const address = server.address();
      if (address && typeof address === "object") resolve(address.port);
      else reject(new Error("The fake inbox has no TCP address"));
    });
  });
}

function closeSmtp(smtp: SMTPServer, sockets: Set<Socket>): Promise<void> {
  return new Promise((resolve) => {
    // close() stops accepting at once, then waits for the open connections.
    smtp.close(() => resolve());
    for (const socket of sockets) socket.destroy();
  });
}

function closeHttp(http: Server): Promise<void> {
  return new Promise((resolve) => {
    http.close(() => resolve());
    http.closeAllConnections();
  });
}

// ---- The readable inbox over HTTP ------------------------------------------

const SECURITY_HEADERS = {
  "Cache-Control": "no-store",
  "X-Content-Type-Options": "nosniff",
  "Referrer-Policy": "no-referrer",
  // Mail HTML is shown in a sandboxed srcdoc frame, which inherits this policy:
  // no scripts and no remote images (no tracking pixels).
  "Content-Security-Policy":
    "default-src 'none'; style-src 'unsafe-inline'; img-src data:; frame-ancestors 'none'",
};

function serveInbox(
  req: IncomingMessage,
  res: ServerResponse,
  messages: () => InboxMessage[],
  clear: () => void,
  smtpAddress: string,
): void {
  // Refuses other Host names, so a web page cannot read the inbox through DNS rebinding.
  if (!isLoopbackHost(hostnameOf(req.headers.host ?? ""))) {
    send(res, 421, "text/plain; charset=utf-8", "Use the loopback address");
    return;
  }
  const origin = `http://${req.headers.host ?? ""}`;
  const path = new URL(req.url ?? "/", "http://inbox.invalid").pathname;
  const method = req.method ?? "GET";

  if (path === "/api/messages") {
    if (method === "GET") {
      send(res, 200, "application/json; charset=utf-8", JSON.stringify(messages()));
    } else if (method === "DELETE") {
      clear();
      res.writeHead(204, SECURITY_HEADERS).end();
    } else {
      notAllowed(res, "GET, DELETE");
    }
    return;
  }
  if (path === "/" || path.startsWith("/messages/")) {
    if (method !== "GET" && method !== "HEAD") {
      notAllowed(res, "GET, HEAD");
      return;
    }
    if (path === "/") {
      send(res, 200, "text/html; charset=utf-8", listPage(messages(), smtpAddress, origin));
      return;
    }
    const id = decodeURIComponent(path.slice("/messages/".length));
    const message = messages().find((m) => m.id === id);
    if (message) send(res, 200, "text/html; charset=utf-8", messagePage(message));
    else send(res, 404, "text/html; charset=utf-8", page("Not found", "<p>No such message.</p>"));
    return;
  }
  send(res, 404, "text/plain; charset=utf-8", "Not found");
}

function hostnameOf(hostHeader: string): string {
  if (hostHeader.startsWith("[")) return hostHeader.slice(0, hostHeader.indexOf("]") + 1);
  return hostHeader.split(":")[0] ?? "";
}

function send(res: ServerResponse, status: number, contentType: string, body: string): void {
  res.writeHead(status, { ...SECURITY_HEADERS, "Content-Type": contentType });
  res.end(res.req.method === "HEAD" ? undefined : body);
}

function notAllowed(res: ServerResponse, allow: string): void {
  res.setHeader("Allow", allow);
  send(res, 405, "text/plain; charset=utf-8", "Method not allowed");
}

/** Escapes text for HTML content and double- or single-quoted attributes. */
function escapeHtml(value: string): string {
  return value
    .replace(/&/g, "&amp;")
    .replace(/</g, "&lt;")
    .replace(/>/g, "&gt;")
    .replace(/"/g, "&quot;")
    .replace(/'/g, "&#39;");
}

function page(title: string, body: string): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)}</title>
<style>
body { font: 15px/1.45 system-ui, sans-serif; margin: 1.5rem; color: #111; }
table { border-collapse: collapse; width: 100%; }
th, td { text-align: left; vertical-align: top; padding: .35rem .6rem; border-bottom: 1px solid #ccc; }
pre { white-space: pre-wrap; background: #f4f4f4; padding: .75rem; }
iframe { width: 100%; height: 32rem; border: 1px solid #ccc; }
a:focus-visible { outline: 3px solid #1a56db; outline-offset: 2px; }
</style>
</head>
<body>
${body}
</body>
</html>
`;
}

function listPage(messages: InboxMessage[], smtpAddress: string, origin: string): string {
  const rows = [...messages]
    .reverse()
    .map(
      (m) => `<tr>
<td><time datetime="${escapeHtml(m.receivedAt)}">${escapeHtml(m.receivedAt)}</time></td>
<td>${escapeHtml(m.from)}</td>
<td>${escapeHtml(m.to.join(", "))}</td>
<td><a href="/messages/${encodeURIComponent(m.id)}">${escapeHtml(m.subject || "(no subject)")}</a></td>
</tr>`,
    )
    .join("\n");
  const count = `${messages.length} message${messages.length === 1 ? "" : "s"}`;
  return page(
    "Mail inbox",
    `<h1>Mail inbox (local SMTP fake)</h1>
<p>Every e-mail sent to SMTP ${escapeHtml(smtpAddress)} lands here and nowhere else. ${count}, newest first; reload to see new ones.
Clear with <code>curl -X DELETE ${escapeHtml(origin)}/api/messages</code>; the same list as JSON: <a href="/api/messages">/api/messages</a>.</p>
${
  messages.length === 0
    ? "<p>No messages yet.</p>"
    : `<table>
<thead><tr><th scope="col">Received (UTC)</th><th scope="col">From</th><th scope="col">To</th><th scope="col">Subject</th></tr></thead>
<tbody>
${rows}
</tbody>
</table>`
}`,
  );
}

function messagePage(m: InboxMessage): string {
  const headerRows = Object.entries(m.headers)
    .map(([k, v]) => `<tr><th scope="row">${escapeHtml(k)}</th><td>${escapeHtml(v)}</td></tr>`)
    .join("\n");
  return page(
    m.subject || "(no subject)",
    `<p><a href="/">Back to the inbox</a></p>
<h1>${escapeHtml(m.subject || "(no subject)")}</h1>
<table>
<tr><th scope="row">Received (UTC)</th><td>${escapeHtml(m.receivedAt)}</td></tr>
<tr><th scope="row">Delivered to</th><td>${escapeHtml(m.to.join(", "))}</td></tr>
</table>
<h2>Text part</h2>
${m.text ? `<pre>${escapeHtml(m.text)}</pre>` : "<p>None.</p>"}
<h2>HTML part</h2>
${
  m.html
    ? `<iframe sandbox="" title="HTML part of the message" srcdoc="${escapeHtml(m.html)}"></iframe>`
    : "<p>None.</p>"
}
<h2>Headers</h2>
<table>
${headerRows}
</table>`,
  );
}
