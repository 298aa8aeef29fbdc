import type { Metadata } from "next";
import { headers } from "next/headers";
import { notFound } from "next/navigation";
import { env } from "@/lib/server/env";
import { readMailbox } from "@/lib/server/mail-fake";
import { mailboxOpenTo } from "@/lib/server/mailbox-gate";
import { addressFromHeaders } from "@/lib/server/rate-limit";

// Demo and dev only: the mail the local SMTP fake captured, so a person can open an invite or reset link
// without a real mailbox. Every reset link of every account shows here, so it answers 404 unless
// MAILBOX_PAGE=on (set by `npm run demo` and `npm run dev`, never by `npm start`), and even then only to
// this computer itself (loopback, as the front door read it from the socket) unless MAILBOX_PAGE_REMOTE=on.

export const metadata: Metadata = { title: "Local mailbox", robots: { index: false } };
export const dynamic = "force-dynamic";

const when = new Intl.DateTimeFormat("en-GB", { dateStyle: "medium", timeStyle: "short", timeZone: "UTC" });

/** Plain text with its links made clickable. */
function Linked({ text }: { text: string }) {
  const parts = text.split(/(https?:\/\/[^\s<>"')\]]+)/g);
  return (
    <>
      {parts.map((p, i) =>
        /^https?:\/\//.test(p) ? (
          <a key={i} href={p} className="break-all font-semibold text-glacier-700 underline">
            {p}
          </a>
        ) : (
          <span key={i}>{p}</span>
        ),
      )}
    </>
  );
}

export default async function MailboxPage() {
  if (!mailboxOpenTo(addressFromHeaders(await headers()))) notFound();
  const mail = readMailbox(env.MAILBOX_DIR);
  return (
    <main className="mx-auto max-w-2xl space-y-4 px-4 py-6">
      <header className="space-y-1">
        <h1 className="text-title font-bold text-glacier-800">Local mailbox</h1>
        <p role="note" className="rounded-card border border-glacier-400 bg-rime-50 p-3 text-label font-semibold text-ink">
          A local stand-in for e-mail, for the demo and development only. A real farm server sends this mail to each person&apos;s own
          inbox and has no such page.
        </p>
        <p className="text-label text-ink-soft">
          Mail caught by the local SMTP server (<code>npm run mail:fake</code>), newest first. Nothing here left this machine. Open an invite link in
          another browser profile to join as that person.
        </p>
      </header>
      {mail.length === 0 ? <p className="rounded-card border border-rime-200 bg-paper p-4 text-ink-soft">No mail yet.</p> : null}
      <ol className="space-y-3">
        {mail.map((m) => (
          <li key={m.id}>
            <article className="space-y-2 rounded-card border border-rime-200 bg-paper p-4 shadow-sm">
              <h2 className="font-semibold text-ink">{m.subject}</h2>
              <p className="text-label text-ink-soft">
                To {m.to.join(", ")} · from {m.from} · {when.format(new Date(m.receivedAt))} UTC
              </p>
              {m.links.length ? (
                <div className="flex flex-wrap gap-2">
                  {m.links.map((l) => (
                    <a key={l} href={l} className="inline-flex min-h-tap items-center rounded-card bg-glacier-700 px-4 py-2 text-label font-semibold text-white hover:bg-glacier-800">
                      Open {new URL(l).pathname.split("/")[1] || "link"} link
                    </a>
                  ))}
                </div>
              ) : null}
              <details>
                <summary className="flex min-h-tap cursor-pointer items-center text-label font-semibold text-glacier-700">Show the message</summary>
                <pre className="whitespace-pre-wrap break-words font-sans text-label text-ink">
                  <Linked text={m.text} />
                </pre>
              </details>
            </article>
          </li>
        ))}
      </ol>
    </main>
  );
}
