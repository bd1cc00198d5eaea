// The local mail catcher: an SMTP server on loopback that keeps every message it receives, so
// development and tests see real e-mail without a real provider.
import { simpleParser } from "mailparser";
import type { AddressInfo } from "node:net";
import { SMTPServer } from "smtp-server";

export interface CaughtMessage {
  to: string[];
  subject: string;
  text: string;
  html: string;
  at: string;
}

const KEEP = 500;

export interface MailCatcher {
  url: string;
  /** Newest first. */
  messages(): CaughtMessage[];
  close(): Promise<void>;
}

export async function startMailCatcher(): Promise<MailCatcher> {
  const caught: CaughtMessage[] = [];
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    banner: "Mechweave local mail catcher",
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((mail) => {
          caught.unshift({
            to: session.envelope.rcptTo.map((r) => r.address),
            subject: mail.subject ?? "",
            text: mail.text ?? "",
            html: typeof mail.html === "string" ? mail.html : "",
            at: new Date().toISOString(),
          });
          caught.length = Math.min(caught.length, KEEP);
          callback();
        })
        .catch((error: Error) => callback(error));
    },
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const { port } = server.server.address() as AddressInfo;
  return {
    url: `smtp://127.0.0.1:${port}`,
    messages: () => caught.slice(),
    close: () => new Promise((resolve) => server.close(() => resolve())),
  };
}
