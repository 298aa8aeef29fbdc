import "server-only";
import nodemailer, { type Transporter } from "nodemailer";
import type { Role } from "@/lib/schemas/vocabulary";
import { vocabularyLabels } from "@/lib/schemas/vocabulary";
import { env } from "./env";

// E-mail over SMTP (SMTP_URL; in dev and tests the local fake in lib/server/mail-fake.ts).
// Every message goes out as plain text plus a simple HTML version of the same words.

export type Mail = { to: string; subject: string; text: string; html: string };

const g = globalThis as unknown as { __rimebookMail?: { url: string; transport: Transporter } };

function transport(): Transporter {
  const url = g.__rimebookMail?.url ?? env.SMTP_URL;
  if (!g.__rimebookMail || g.__rimebookMail.url !== url) {
    // Local fakes speak plain SMTP; a provider URL (smtps:// or ?secure) negotiates TLS as it says.
    g.__rimebookMail = { url, transport: nodemailer.createTransport(url) };
  }
  return g.__rimebookMail.transport;
}

/** Tests (and the demo) point mail at a fake started in-process. */
export function useSmtp(url: string): void {
  g.__rimebookMail?.transport.close();
  g.__rimebookMail = { url, transport: nodemailer.createTransport(url) };
}

/** Sends one message; resolves false (and logs, without the body) when the mail server cannot be reached. */
export async function sendMail(mail: Mail): Promise<boolean> {
  try {
    await transport().sendMail({ from: env.MAIL_FROM, ...mail });
    return true;
  } catch (err) {
    console.error(`[rimebook] mail to ${mail.to} not sent: ${(err as Error).message}`);
    return false;
  }
}

const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);

/** The shared frame: a calm card, one button, the link spelled out for mail apps that hide buttons. */
function layout(opts: { greeting: string; paragraphs: string[]; button: { label: string; href: string }; footer: string[] }): { text: string; html: string } {
  const text = [opts.greeting, "", ...opts.paragraphs.flatMap((p) => [p, ""]), `${opts.button.label}: ${opts.button.href}`, "", ...opts.footer, "", "— Rimebook"].join("\n");
  const p = (s: string) => `<p style="margin:0 0 14px;line-height:1.5">${escapeHtml(s)}</p>`;
  const html = `<!doctype html><html><body style="margin:0;background:#f4f8fa;font-family:system-ui,-apple-system,Segoe UI,sans-serif;color:#10263a">
<div style="max-width:520px;margin:0 auto;padding:24px 16px">
<div style="font-weight:700;font-size:20px;color:#173a52;margin-bottom:16px">Rimebook</div>
<div style="background:#ffffff;border:1px solid #cddde5;border-radius:16px;padding:20px">
${p(opts.greeting)}
${opts.paragraphs.map(p).join("\n")}
<p style="margin:20px 0"><a href="${escapeHtml(opts.button.href)}" style="display:inline-block;background:#1f4d6c;color:#ffffff;text-decoration:none;font-weight:600;padding:12px 20px;border-radius:12px">${escapeHtml(opts.button.label)}</a></p>
<p style="margin:0 0 14px;font-size:14px;color:#3d5364;word-break:break-all">Or open this link: <a href="${escapeHtml(opts.button.href)}" style="color:#2c6489">${escapeHtml(opts.button.href)}</a></p>
</div>
${opts.footer.map((f) => `<p style="font-size:13px;color:#3d5364;line-height:1.5;margin:12px 4px 0">${escapeHtml(f)}</p>`).join("\n")}
</div></body></html>`;
  return { text, html };
}

const roleWords: Record<Role, string> = {
  owner: "as an Owner: you can do everything, including managing the team",
  grower: "as a Grower: you can plan, keep lots, protocols and bags, and record checks",
  helper: "as a Helper: you can record checks, pulls, sowings and counts",
  visitor: "as a Visitor: you can see the farm's records",
};

export function inviteMail(opts: { to: string; farmName: string; inviterName: string; role: Role; link: string; expiresAt: string }): Mail {
  const until = new Date(opts.expiresAt).toUTCString().replace(/:\d\d GMT$/, " UTC");
  const subject = `${opts.inviterName} invited you to ${opts.farmName} on Rimebook`;
  const body = layout({
    greeting: "Hello,",
    paragraphs: [
      `${opts.inviterName} has invited you to join ${opts.farmName} on Rimebook ${roleWords[opts.role]}.`,
      "Rimebook keeps the farm's seed bags, checks and cold stores in one shared record that works at the fridge, even without signal.",
      `The link works once and until ${until}. If you already use Rimebook with this e-mail, you will just add ${opts.farmName} to your account.`,
    ],
    button: { label: `Join as ${vocabularyLabels.role[opts.role]}`, href: opts.link },
    footer: ["If you were not expecting this, you can ignore this e-mail; nothing happens unless the link is opened and accepted."],
  });
  return { to: opts.to, subject, ...body };
}

export function resetMail(opts: { to: string; name: string; link: string; minutes: number }): Mail {
  const body = layout({
    greeting: `Hello ${opts.name},`,
    paragraphs: [
      "Someone (we hope you) asked to choose a new Rimebook password for this e-mail.",
      `The link works once, for the next ${opts.minutes} minutes. Choosing a new password signs you out on every other phone and computer.`,
    ],
    button: { label: "Choose a new password", href: opts.link },
    footer: ["If you did not ask for this, ignore this e-mail: your password stays as it is."],
  });
  return { to: opts.to, subject: "Choose a new Rimebook password", ...body };
}

/** An absolute link into the app. */
export const appLink = (path: string) => new URL(path, env.APP_ORIGIN).toString();
