import { NextResponse } from "next/server";
import { requireMember } from "@/lib/server/auth";
import { getDb } from "@/lib/server/db";
import { route } from "@/lib/server/http";
import { sendInviteMail } from "@/lib/server/invite-mail";
import { resendInvite } from "@/lib/server/team";

export const dynamic = "force-dynamic";

type Ctx = { params: Promise<{ id: string }> };

/** Sends a pending invite again with a fresh link and expiry; the old link stops working (Owner). */
export const POST = route<Ctx>(async (req, { params }) => {
  const member = await requireMember(req, "team.manage");
  const { id } = await params;
  const { invite, token } = await getDb().transaction((trx) => resendInvite(trx, member.farmId, id));
  const mailSent = await sendInviteMail(member, invite, token);
  return NextResponse.json({ invite, mailSent });
});
