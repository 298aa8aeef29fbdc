import { SignInInput } from "@/lib/schemas/account";
import { assertSameOrigin, signedInResponse } from "@/lib/server/auth";
import { authenticate } from "@/lib/server/accounts";
import { getDb } from "@/lib/server/db";
import { readJson, route } from "@/lib/server/http";
import { clientAddress } from "@/lib/server/rate-limit";

export const dynamic = "force-dynamic";

/** E-mail + password → {user, farm, role, farms} and the session cookie; 401 on a mismatch, 429 when locked. */
export const POST = route(async (req) => {
  assertSameOrigin(req);
  const input = await readJson(req, SignInInput);
  const who = await authenticate(getDb(), { ...input, ip: clientAddress(req) });
  return signedInResponse(req, who);
});
