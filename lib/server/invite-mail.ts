import "server-only";
import type { Member } from "./auth";
import { appLink, inviteMail, sendMail } from "./mail";
import type { PendingInvite } from "./team";

/** E-mails an invite link; false when the mail server could not be reached (the invite stays, resend later). */
export function sendInviteMail(from: Pick<Member, "name" | "farmName">, invite: PendingInvite, token: string): Promise<boolean> {
  return sendMail(
    inviteMail({ to: invite.email, farmName: from.farmName, inviterName: from.name, role: invite.role, link: appLink(`/invite/${token}`), expiresAt: invite.expiresAt }),
  );
}
