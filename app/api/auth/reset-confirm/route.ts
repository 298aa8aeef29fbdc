import { NextResponse } from "next/server";
import { ResetConfirmInput } from "@/lib/schemas/account";
import { assertSameOrigin, signedInResponse } from "@/lib/server/auth";
import { farmsOf } from "@/lib/server/accounts";
import { getDb } from "@/lib/server/db";
import { readJson, route } from "@/lib/server/http";
import { confirmPasswordReset } from "@/lib/server/password-reset";
import { clientAddress, recordSignInAttempt } from "@/lib/server/rate-limit";

export const dynamic = "force-dynamic";

/** Sets the new password (the link then stops working), ends every old session, and signs in here. */
export const POST = route(async (req) => {
  assertSameOrigin(req);
  const input = await readJson(req, ResetConfirmInput);
  const { userId, email } = await getDb().transaction((trx) => confirmPasswordReset(trx, input));
  // Proving the mailbox clears a sign-in lock on the account.
  await recordSignInAttempt(getDb(), { email, ip: clientAddress(req) }, true);
  const farm = (await farmsOf(getDb(), userId))[0];
  if (!farm) return NextResponse.json({ ok: true, signedIn: false });
  return signedInResponse(req, { userId, farmId: farm.id });
});
