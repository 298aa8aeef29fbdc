// The local mailbox for dev and the demo: `npm run mail:fake`. Listens on SMTP_URL's port
// (default 2525) and stores each message under MAILBOX_DIR (default data/mailbox), where the
// /dev/mailbox page lists it.
import { DEFAULT_MAILBOX_DIR, startMailFake } from "../lib/server/mail-fake";

const url = new URL(process.env.SMTP_URL ?? "smtp://127.0.0.1:2525");
const port = Number(url.port || 2525);
const host = url.hostname === "localhost" ? "127.0.0.1" : url.hostname;
const dir = process.env.MAILBOX_DIR ?? DEFAULT_MAILBOX_DIR;

startMailFake({ port, host, dir }).then(
  (fake) => {
    console.log(`[mailbox] local SMTP on ${fake.host}:${fake.port}, storing mail in ${fake.dir}`);
    const stop = () => fake.close().then(() => process.exit(0));
    process.on("SIGINT", stop);
    process.on("SIGTERM", stop);
  },
  (err: Error) => {
    console.error(`[mailbox] could not start: ${err.message}`);
    process.exit(1);
  },
);
