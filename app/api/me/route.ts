import { NextResponse } from "next/server";
import { ProfileInput } from "@/lib/schemas/account";
import { identityOf, requireMember, withSessionCookie, type Member } from "@/lib/server/auth";
import { farmsOf, updateDisplayName } from "@/lib/server/accounts";
import { getDb } from "@/lib/server/db";
import { readJson, route } from "@/lib/server/http";

export const dynamic = "force-dynamic";

/** {user, farm, role, farms}: what the phone keeps to open offline and to offer the farm switcher. */
async function answer(member: Member): Promise<Response> {
  const farms = await farmsOf(getDb(), member.userId);
  return withSessionCookie(NextResponse.json({ ...identityOf(member), farms }, { headers: { "Cache-Control": "no-store" } }), member);
}

/** Who is signed in, on which farm, with which role (the phone keeps this to open offline). */
export const GET = route(async (req) => answer(await requireMember(req)));

/** The person's own display name; answers the identity with the new name. */
export const PATCH = route(async (req) => {
  const { name } = await readJson(req, ProfileInput);
  const member = await requireMember(req);
  const saved = await getDb().transaction((trx) => updateDisplayName(trx, member.userId, name));
  return answer({ ...member, name: saved });
});
