import { NextResponse } from "next/server";
import { requireMember } from "@/lib/server/auth";
import { getDb } from "@/lib/server/db";
import { route } from "@/lib/server/http";
import { revokeInvite } from "@/lib/server/team";

export const dynamic = "force-dynamic";

type Ctx = { params: Promise<{ id: string }> };

/** Withdraws a pending invite: its link stops working (Owner; another farm's invite is 404). */
export const DELETE = route<Ctx>(async (req, { params }) => {
  const member = await requireMember(req, "team.manage");
  const { id } = await params;
  await getDb().transaction((trx) => revokeInvite(trx, member.farmId, id));
  return NextResponse.json({ ok: true });
});
