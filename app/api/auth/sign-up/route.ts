import { SignUpInput } from "@/lib/schemas/account";
import { assertSameOrigin, signedInResponse } from "@/lib/server/auth";
import { createFarmWithOwner } from "@/lib/server/accounts";
import { getDb } from "@/lib/server/db";
import { readJson, route } from "@/lib/server/http";
import { assertSignUpAllowed, clientAddress, recordSignUpAttempt } from "@/lib/server/rate-limit";

export const dynamic = "force-dynamic";

/** A new farm, its Owner and the starter protocol library; signs the Owner in (201 + cookie). 429 when the address has started too many. */
export const POST = route(async (req) => {
  assertSameOrigin(req);
  const input = await readJson(req, SignUpInput);
  const ip = clientAddress(req);
  await assertSignUpAllowed(getDb(), ip);
  await recordSignUpAttempt(getDb(), ip);
  const who = await getDb().transaction((trx) => createFarmWithOwner(trx, input));
  return signedInResponse(req, who, 201);
});
