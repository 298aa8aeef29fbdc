import { NextResponse } from "next/server";
import { canRun } from "@/lib/schemas/mutations";
import { requireMember } from "@/lib/server/auth";
import { getDb } from "@/lib/server/db";
import { route } from "@/lib/server/http";
import { listMembers, listPendingInvites } from "@/lib/server/team";

export const dynamic = "force-dynamic";

/** The farm's members (every member may see who is on the team); pending invites for Owners only. */
export const GET = route(async (req) => {
  const member = await requireMember(req);
  const manage = canRun(member.role, "team.manage");
  return NextResponse.json(
    {
      you: { userId: member.userId, role: member.role, canManage: manage },
      members: await listMembers(getDb(), member.farmId),
      invites: manage ? await listPendingInvites(getDb(), member.farmId) : [],
    },
    { headers: { "Cache-Control": "no-store" } },
  );
});
