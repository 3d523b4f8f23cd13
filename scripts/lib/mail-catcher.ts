import { randomUUID } from "node:crypto";
import http from "node:http";
import { simpleParser } from "mailparser";
import { SMTPServer } from "smtp-server";

/** One message as the local catcher captured it. */
export interface CapturedMail {
  id: string;
  receivedAt: string;
  envelopeFrom: string;
  envelopeTo: string[];
  messageId: string | null;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string | null;
  headers: Record<string, string>;
}

export interface MailCatcher {
  smtpPort: number;
  httpPort: number;
  messages: CapturedMail[];
  stop(): Promise<void>;
}

function addressList(value: unknown): string[] {
  if (!value) return [];
  const list = Array.isArray(value) ? value : [value];
  return list.flatMap((entry: { value?: { address?: string }[] }) => (entry.value ?? []).map((a) => a.address ?? ""));
}

/**
 * A fake SMTP server for local development and tests: accepts every message on loopback, keeps it in
 * memory and serves the list as JSON over HTTP (`GET /messages`, `DELETE /messages`).
 */
export async function startMailCatcher(options: { smtpPort: number; httpPort: number; limit?: number }): Promise<MailCatcher> {
  const messages: CapturedMail[] = [];
  const limit = options.limit ?? 2000;

  const smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    logger: false,
    size: 10 * 1024 * 1024,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((parsed) => {
          const headers: Record<string, string> = {};
          for (const [key, value] of parsed.headers) {
            headers[key] = typeof value === "string" ? value : JSON.stringify(value);
          }
          messages.push({
            id: randomUUID(),
            receivedAt: new Date().toISOString(),
            envelopeFrom: session.envelope.mailFrom ? session.envelope.mailFrom.address : "",
            envelopeTo: session.envelope.rcptTo.map((r) => r.address),
            messageId: parsed.messageId ?? null,
            from: parsed.from?.text ?? "",
            to: addressList(parsed.to),
            subject: parsed.subject ?? "",
            text: parsed.text ?? "",
            html: typeof parsed.html === "string" ? parsed.html : null,
            headers,
          });
          if (messages.length > limit) messages.splice(0, messages.length - limit);
          callback();
        })
        .catch((error: Error) => callback(error));
    },
  });

  const api = http.createServer((req, res) => {
    if (req.url?.startsWith("/messages")) {
      if (req.method === "DELETE") {
        messages.length = 0;
        res.writeHead(204).end();
        return;
      }
      if (req.method === "GET") {
        res.writeHead(200, { "content-type": "application/json" });
        res.end(JSON.stringify({ messages: [...messages].reverse() }));
        return;
      }
    }
    res.writeHead(404, { "content-type": "application/json" }).end('{"error":"not found"}');
  });

  await new Promise<void>((resolve, reject) => {
    smtp.once("error", reject);
    smtp.listen(options.smtpPort, "127.0.0.1", () => resolve());
  });
  await new Promise<void>((resolve, reject) => {
    api.once("error", reject);
    api.listen(options.httpPort, "127.0.0.1", () => resolve());
  });

  return {
    smtpPort: options.smtpPort,
    httpPort: options.httpPort,
    messages,
    stop: async () => {
      await new Promise<void>((resolve) => smtp.close(() => resolve()));
      await new Promise<void>((resolve) => {
        api.closeAllConnections();
        api.close(() => resolve());
      });
    },
  };
}
