import { notFound } from "@/lib/errors";
import { SwitchFarmInput } from "@/lib/schemas/account";
import { requireMember, signedInResponse } from "@/lib/server/auth";
import { farmsOf } from "@/lib/server/accounts";
import { getDb } from "@/lib/server/db";
import { readJson, route } from "@/lib/server/http";
import { revokeSession } from "@/lib/server/sessions";

export const dynamic = "force-dynamic";

/** Opens another farm the person belongs to (a new session on that farm replaces this one). */
export const POST = route(async (req) => {
  const member = await requireMember(req);
  const { farmId } = await readJson(req, SwitchFarmInput);
  if (!(await farmsOf(getDb(), member.userId)).some((f) => f.id === farmId)) throw notFound("That farm");
  await revokeSession(getDb(), member.sessionId);
  return signedInResponse(req, { userId: member.userId, farmId });
});
