import { NextResponse } from "next/server";
import { z } from "zod";
import { AppError } from "@/lib/errors";
import { InviteAcceptInput, LinkToken } from "@/lib/schemas/account";
import { assertSameOrigin, signedInResponse } from "@/lib/server/auth";
import { getDb } from "@/lib/server/db";
import { readJson, readQuery, route } from "@/lib/server/http";
import { assertSignInAllowed, clientAddress, recordSignInAttempt } from "@/lib/server/rate-limit";
import { acceptInvite, describeInvite } from "@/lib/server/team";

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
  const db = getDb();
  const invite = await describeInvite(db, input.token);
  // An existing account's password is checked here too, so it gets the same rate limit as sign-in.
  const keys = { email: invite.email, ip: clientAddress(req) };
  if (invite.existingAccount) await assertSignInAllowed(db, keys);
  let joined: Awaited<ReturnType<typeof acceptInvite>>;
  try {
    joined = await db.transaction((trx) => acceptInvite(trx, input));
  } catch (err) {
    if (invite.existingAccount && err instanceof AppError && err.code === "unauthenticated") await recordSignInAttempt(db, keys, false);
    throw err;
  }
  if (invite.existingAccount) await recordSignInAttempt(db, keys, true);
  return signedInResponse(req, { userId: joined.userId, farmId: joined.farmId }, joined.created ? 201 : 200);
});
