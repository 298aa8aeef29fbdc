import { NextResponse } from "next/server";
import { ResetRequestInput } from "@/lib/schemas/account";
import { assertSameOrigin } from "@/lib/server/auth";
import { getDb } from "@/lib/server/db";
import { readJson, route } from "@/lib/server/http";
import { appLink, resetMail, sendMail } from "@/lib/server/mail";
import { RESET_MINUTES, requestPasswordReset } from "@/lib/server/password-reset";

export const dynamic = "force-dynamic";

/** Always the same answer, whether or not the e-mail has an account. */
export const POST = route(async (req) => {
  assertSameOrigin(req);
  const { email } = await readJson(req, ResetRequestInput);
  const reset = await getDb().transaction((trx) => requestPasswordReset(trx, email));
  if (reset) {
    await sendMail(resetMail({ to: reset.email, name: reset.name, link: appLink(`/reset/${reset.token}`), minutes: RESET_MINUTES }));
  }
  return NextResponse.json(
    { ok: true, message: `If ${email} has a Rimebook account, a link to choose a new password is on its way. It works once, for ${RESET_MINUTES} minutes.` },
    { status: 202 },
  );
});
