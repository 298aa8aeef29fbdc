import { NextResponse } from "next/server";
import { identityOf, requireMember, withSessionCookie } from "@/lib/server/auth";
import { farmsOf } from "@/lib/server/accounts";
import { getDb } from "@/lib/server/db";
import { route } from "@/lib/server/http";

export const dynamic = "force-dynamic";

/** Who is signed in, on which farm, with which role (the phone keeps this to open offline). */
export const GET = route(async (req) => {
  const member = await requireMember(req);
  const farms = await farmsOf(getDb(), member.userId);
  return withSessionCookie(NextResponse.json({ ...identityOf(member), farms }, { headers: { "Cache-Control": "no-store" } }), member);
});
