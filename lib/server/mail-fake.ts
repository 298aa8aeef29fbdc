// A local stand-in for a real mail provider: an SMTP server (smtp-server) that accepts every
// message and stores it as a JSON file, so a person can open an invite link on the dev mailbox
// page and tests can read what was really sent over SMTP.
// No "server-only" here: plain Node scripts (npm run mail:fake, the demo) start it too.
import fs from "node:fs";
import path from "node:path";
import { randomUUID } from "node:crypto";
import type { AddressInfo } from "node:net";
import { SMTPServer } from "smtp-server";
import { simpleParser, type AddressObject } from "mailparser";

export type CapturedMail = {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string | null;
  /** Every http(s) link in the message, in order, for the mailbox page and tests. */
  links: string[];
};

export const DEFAULT_MAILBOX_DIR = "data/mailbox";
const MAX_MESSAGE_BYTES = 2 * 1024 * 1024;

const addressesOf = (a: AddressObject | AddressObject[] | undefined): string[] =>
  (Array.isArray(a) ? a : a ? [a] : []).flatMap((o) => o.value.map((v) => v.address ?? "").filter(Boolean));

export function findLinks(text: string): string[] {
  return [...new Set(text.match(/https?:\/\/[^\s<>"')\]]+/g) ?? [])];
}

export type MailFake = { port: number; host: string; dir: string; close: () => Promise<void> };

/** Starts the fake SMTP server (port 0 picks a free port). Resolves once it listens. */
export async function startMailFake(opts: { port?: number; host?: string; dir?: string; quiet?: boolean } = {}): Promise<MailFake> {
  const dir = path.resolve(opts.dir ?? DEFAULT_MAILBOX_DIR);
  const host = opts.host ?? "127.0.0.1";
  fs.mkdirSync(dir, { recursive: true });

  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    size: MAX_MESSAGE_BYTES,
    banner: "Rimebook local mailbox (nothing leaves this machine)",
    logger: false,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((mail) => {
          const text = mail.text ?? "";
          const html = typeof mail.html === "string" ? mail.html : null;
          const captured: CapturedMail = {
            id: randomUUID(),
            receivedAt: new Date().toISOString(),
            from: addressesOf(mail.from)[0] ?? session.envelope.mailFrom?.toString() ?? "",
            to: session.envelope.rcptTo.map((r) => r.address),
            subject: mail.subject ?? "(no subject)",
            text,
            html,
            links: findLinks(text),
          };
          const name = `${captured.receivedAt.replace(/[:.]/g, "-")}-${captured.id.slice(0, 8)}.json`;
          fs.writeFileSync(path.join(dir, name), JSON.stringify(captured, null, 2));
          if (!opts.quiet) console.log(`[mailbox] ${captured.to.join(", ")}: ${captured.subject}`);
          callback();
        })
        .catch((err: Error) => callback(err));
    },
  });

  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(opts.port ?? 2525, host, () => resolve());
  });
  server.on("error", (err) => console.error("[mailbox] error", err));
  const port = (server.server.address() as AddressInfo).port;
  return {
    port,
    host,
    dir,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

/** Captured mail, newest first. */
export function readMailbox(dir: string = DEFAULT_MAILBOX_DIR, limit = 200): CapturedMail[] {
  const abs = path.resolve(dir);
  if (!fs.existsSync(abs)) return [];
  return fs
    .readdirSync(abs)
    .filter((f) => f.endsWith(".json"))
    .sort()
    .reverse()
    .slice(0, limit)
    .flatMap((f) => {
      try {
        return [JSON.parse(fs.readFileSync(path.join(abs, f), "utf8")) as CapturedMail];
      } catch {
        return [];
      }
    });
}
