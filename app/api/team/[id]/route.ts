import { NextResponse } from "next/server";
import { RoleChangeInput } from "@/lib/schemas/account";
import { requireMember } from "@/lib/server/auth";
import { getDb } from "@/lib/server/db";
import { readJson, route } from "@/lib/server/http";
import { changeRole, removeMember } from "@/lib/server/team";

export const dynamic = "force-dynamic";

type Ctx = { params: Promise<{ id: string }> };

/** Changes a member's role (Owner). The last Owner cannot be demoted (409). */
export const PATCH = route<Ctx>(async (req, { params }) => {
  const member = await requireMember(req, "team.manage");
  const { id } = await params;
  const { role } = await readJson(req, RoleChangeInput);
  const updated = await getDb().transaction((trx) => changeRole(trx, member.farmId, id, role));
  return NextResponse.json({ member: updated });
});

/** Removes a member from the farm and ends their sessions here (Owner). The last Owner stays. */
export const DELETE = route<Ctx>(async (req, { params }) => {
  const member = await requireMember(req, "team.manage");
  const { id } = await params;
  await getDb().transaction((trx) => removeMember(trx, member.farmId, id));
  return NextResponse.json({ ok: true });
});
