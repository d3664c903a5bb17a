// The demo's local mail sink: a real SMTP server on loopback that keeps what it receives,
// and a small HTTP API the demo mailbox page and the tests read it through.
import http from "node:http";
import { SMTPServer } from "smtp-server";
import { simpleParser } from "mailparser";

export interface SunkMessage {
  id: number;
  receivedAt: number;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string | null;
}

const SMTP_PORT = Number(process.env.MAIL_SINK_SMTP_PORT ?? 2525);
const HTTP_PORT = Number(process.env.MAIL_SINK_HTTP_PORT ?? 2526);
const KEEP = 500;

const messages: SunkMessage[] = [];
let nextId = 1;

const smtp = new SMTPServer({
  authOptional: true,
  disabledCommands: ["STARTTLS"],
  size: 2 * 1024 * 1024,
  onData(stream, session, callback) {
    simpleParser(stream)
      .then((mail) => {
        messages.push({
          id: nextId++,
          receivedAt: Date.now(),
          from: session.envelope.mailFrom ? session.envelope.mailFrom.address : "",
          to: session.envelope.rcptTo.map((r) => r.address),
          subject: mail.subject ?? "",
          text: mail.text ?? "",
          html: typeof mail.html === "string" ? mail.html : null,
        });
        if (messages.length > KEEP) messages.shift();
        callback();
      })
      .catch((err: Error) => callback(err));
  },
});
smtp.listen(SMTP_PORT, "127.0.0.1", () => console.log(`[mail-sink] SMTP on 127.0.0.1:${SMTP_PORT}`));

http
  .createServer((req, res) => {
    const url = new URL(req.url ?? "/", "http://localhost");
    if (req.method === "GET" && url.pathname === "/messages") {
      const to = url.searchParams.get("to");
      const list = to ? messages.filter((m) => m.to.includes(to)) : messages;
      res.writeHead(200, { "content-type": "application/json" });
      res.end(JSON.stringify({ messages: [...list].reverse() }));
      return;
    }
    if (req.method === "DELETE" && url.pathname === "/messages") {
      messages.length = 0;
      res.writeHead(204).end();
      return;
    }
    res.writeHead(404, { "content-type": "application/json" }).end(JSON.stringify({ error: "not found" }));
  })
  .listen(HTTP_PORT, "127.0.0.1", () => console.log(`[mail-sink] HTTP on http://127.0.0.1:${HTTP_PORT}/messages`));
