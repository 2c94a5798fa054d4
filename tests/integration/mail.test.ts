import { connect } from "node:net";
import { afterEach, describe, expect, it } from "vitest";
import { startFakeInbox, type FakeInbox, type InboxMessage } from "@/lib/mail/fake-inbox";
import { createMailTransport, type MailTransporter } from "@/lib/mail/transport";

// Real SMTP over loopback: nodemailer → the fake inbox. No database needed.

const started: FakeInbox[] = [];
async function start(opts?: Parameters<typeof startFakeInbox>[0]): Promise<FakeInbox> {
  const inbox = await startFakeInbox(opts);
  started.push(inbox);
  return inbox;
}
afterEach(async () => {
  await Promise.all(started.splice(0).map((inbox) => inbox.stop()));
});

function transportTo(inbox: FakeInbox): MailTransporter {
  return createMailTransport({ host: inbox.host, port: inbox.smtpPort });
}

const FROM = "Tidemark <tidemark@kestrel.example>";

describe("the local fake inbox", () => {
  it("receives a message sent over SMTP with its Message-ID, recipients and both parts", async () => {
    const inbox = await start({ smtpPort: 0, httpPort: 0 });
    expect(inbox.smtpPort).toBeGreaterThan(0);
    expect(inbox.httpPort).toBeGreaterThan(0);

    const info = await transportTo(inbox).sendMail({
      from: FROM,
      to: "charge.nurse@test.kestrel.example",
      subject: "SpO2 below band: bed 4",
      text: "SpO2 86 % below the band 88–92 %.",
      html: "<p>SpO2 <strong>86 %</strong> below the band 88–92 %.</p>",
      messageId: "<t-1@tidemark.test>",
    });
    expect(info.accepted).toEqual(["charge.nurse@test.kestrel.example"]);

    const messages = inbox.messages();
    expect(messages).toHaveLength(1);
    const [message] = messages as [InboxMessage];
    expect(message).toMatchObject({
      messageId: "<t-1@tidemark.test>",
      from: FROM,
      to: ["charge.nurse@test.kestrel.example"],
      subject: "SpO2 below band: bed 4",
    });
    expect(message.text.trim()).toBe("SpO2 86 % below the band 88–92 %.");
    expect(message.html).toContain("<strong>86 %</strong>");
    expect(message.headers["message-id"]).toBe("<t-1@tidemark.test>");
    expect(Date.parse(message.receivedAt)).not.toBeNaN();
  });

  it("serves the inbox over HTTP as JSON and as an escaped HTML page, and clears it", async () => {
    const inbox = await start({ smtpPort: 0, httpPort: 0 });
    const subject = `Alert <script>alert("x")</script> & more`;
    await transportTo(inbox).sendMail({
      from: FROM,
      to: "charge.nurse@test.kestrel.example",
      subject,
      text: "plain",
      html: "<p>rich</p>",
      messageId: "<t-2@tidemark.test>",
    });
    const base = `http://127.0.0.1:${inbox.httpPort}`;

    const api = await fetch(`${base}/api/messages`);
    expect(api.status).toBe(200);
    const listed = (await api.json()) as InboxMessage[];
    expect(listed.map((m) => [m.messageId, m.subject])).toEqual([["<t-2@tidemark.test>", subject]]);

    const html = await (await fetch(`${base}/`)).text();
    expect(html).toContain("Alert &lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; &amp; more");
    expect(html).not.toContain("<script>");

    const id = listed[0]?.id ?? "";
    const detail = await fetch(`${base}/messages/${id}`);
    expect(detail.status).toBe(200);
    const detailHtml = await detail.text();
    // The HTML part is shown only inside a sandboxed frame, as an escaped attribute.
    expect(detailHtml).toContain(
      `<iframe sandbox="" title="HTML part of the message" srcdoc="&lt;p&gt;rich&lt;/p&gt;`,
    );
    expect(detailHtml).toContain("<pre>plain");
    expect((await fetch(`${base}/messages/no-such-id`)).status).toBe(404);

    expect((await fetch(`${base}/api/messages`, { method: "DELETE" })).status).toBe(204);
    expect(inbox.messages()).toEqual([]);
    expect(await (await fetch(`${base}/api/messages`)).json()).toEqual([]);
  });

  it("refuses connections once stopped and receives again when restarted on the same port", async () => {
    const first = await start({ smtpPort: 0, httpPort: 0 });
    const { smtpPort, httpPort } = first;
    const transport = transportTo(first);
    await first.stop();

    const startedAt = Date.now();
    const failure = await transport
      .sendMail({
        from: FROM,
        to: "a@test.kestrel.example",
        text: "lost",
        messageId: "<t-3@tidemark.test>",
      })
      .then(
        () => null,
        (err: Error & { code?: string }) => err,
      );
    expect(failure?.message).toMatch(/ECONNREFUSED/);
    expect(failure?.code).toBe("ESOCKET");
    expect(Date.now() - startedAt).toBeLessThan(5_000);

    const second = await start({ smtpPort, httpPort });
    expect([second.smtpPort, second.httpPort]).toEqual([smtpPort, httpPort]);
    await transport.sendMail({
      from: FROM,
      to: "a@test.kestrel.example",
      text: "kept",
      messageId: "<t-4@tidemark.test>",
    });
    expect(second.messages().map((m) => m.messageId)).toEqual(["<t-4@tidemark.test>"]);
  });

  it("stops promptly while a client holds an SMTP connection open", async () => {
    const inbox = await start({ smtpPort: 0, httpPort: null });
    expect(inbox.httpPort).toBeNull();
    const client = connect(inbox.smtpPort, inbox.host);
    const closed = new Promise<void>((resolve) => client.once("close", () => resolve()));
    client.on("error", () => {});
    // Wait for the greeting, so the connection is established on the server's side.
    await new Promise<void>((resolve) => client.once("data", () => resolve()));

    const startedAt = Date.now();
    await inbox.stop();
    expect(Date.now() - startedAt).toBeLessThan(2_000);
    await closed;
  });

  it("refuses a message over the size limit", async () => {
    const inbox = await start({ smtpPort: 0, httpPort: null });
    const failure = await transportTo(inbox)
      .sendMail({
        envelope: { from: "tidemark@kestrel.example", to: "a@test.kestrel.example" },
        // Prebuilt, so the 6 MB need no encoding on the way.
        raw: `Subject: too big\r\n\r\n${`${"x".repeat(76)}\r\n`.repeat(80_000)}`,
      })
      .then(
        () => null,
        (err: Error & { responseCode?: number }) => err,
      );
    expect(failure?.responseCode).toBe(552);
    expect(inbox.messages()).toEqual([]);
  });

  it("listens on loopback only", async () => {
    await expect(startFakeInbox({ host: "0.0.0.0", smtpPort: 0, httpPort: null })).rejects.toThrow(
      /loopback only/,
    );
  });
});
