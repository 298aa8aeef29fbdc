import { NextResponse } from "next/server";
import { InviteAcceptInput, LinkToken } from "@/lib/schemas/account";
import { assertSameOrigin, signedInResponse } from "@/lib/server/auth";
import { getDb } from "@/lib/server/db";
import { readJson, readQuery, route } from "@/lib/server/http";
import { acceptInvite, describeInvite } from "@/lib/server/team";
import { z } from "zod";

export const dynamic = "force-dynamic";

/** What an invite link is for (farm, role, e-mail, whether that e-mail already has an account). */
export const GET = route(async (req) => {
  const { token } = readQuery(req, z.object({ token: LinkToken }));
  return NextResponse.json(await describeInvite(getDb(), token), { headers: { "Cache-Control": "no-store" } });
});

/** Accepts the invite once and signs the person in on that farm. */
export const POST = route(async (req) => {
  assertSameOrigin(req);
  const input = await readJson(req, InviteAcceptInput);
  const { userId, farmId, created } = await getDb().transaction((trx) => acceptInvite(trx, input));
  return signedInResponse(req, { userId, farmId }, created ? 201 : 200);
});
