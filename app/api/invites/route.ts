import { NextResponse } from "next/server";
import { InviteInput } from "@/lib/schemas/account";
import { requireMember } from "@/lib/server/auth";
import { getDb } from "@/lib/server/db";
import { readJson, route } from "@/lib/server/http";
import { sendInviteMail } from "@/lib/server/invite-mail";
import { createInvite, listPendingInvites } from "@/lib/server/team";

export const dynamic = "force-dynamic";

/** Pending invites of the farm (Owner). */
export const GET = route(async (req) => {
  const member = await requireMember(req, "team.manage");
  return NextResponse.json({ invites: await listPendingInvites(getDb(), member.farmId) });
});

/** Invites a person by e-mail with a one-time link (Owner). */
export const POST = route(async (req) => {
  const member = await requireMember(req, "team.manage");
  const input = await readJson(req, InviteInput);
  const { invite, token } = await getDb().transaction((trx) => createInvite(trx, member.farmId, member.userId, input));
  const mailSent = await sendInviteMail(member, invite, token);
  return NextResponse.json({ invite, mailSent }, { status: 201 });
});
