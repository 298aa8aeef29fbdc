import type { Metadata } from "next";
import { AcceptInviteForm } from "@/components/auth/AcceptInviteForm";
import { FormMessage, TextLink } from "@/components/auth/form-kit";
import { AppError } from "@/lib/errors";
import { vocabularyLabels } from "@/lib/schemas/vocabulary";
import { getDb } from "@/lib/server/db";
import { describeInvite } from "@/lib/server/team";
import { LinkToken } from "@/lib/schemas/account";

export const metadata: Metadata = { title: "Join a farm", referrer: "no-referrer" };
export const dynamic = "force-dynamic";

const roleSummary = {
  owner: "You will be able to do everything, including managing the team.",
  grower: "You will plan the season and keep lots, protocols, bags and checks.",
  helper: "You will record checks, pulls, sowings and counts.",
  visitor: "You will see the farm's records.",
} as const;

export default async function InvitePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  let invite: Awaited<ReturnType<typeof describeInvite>> | null = null;
  let problem: string | null = null;
  if (!LinkToken.safeParse(token).success) problem = "This invite link is not complete. Open it again from the e-mail, or ask the farm's Owner to send it again.";
  else {
    try {
      invite = await describeInvite(getDb(), token);
    } catch (err) {
      if (!(err instanceof AppError)) throw err;
      problem = err.message;
    }
  }

  if (!invite) {
    return (
      <section className="space-y-5">
        <h1 className="text-display font-bold leading-tight text-ink">This invite cannot be used</h1>
        <FormMessage message={problem} />
        <TextLink href="/sign-in">Go to sign in</TextLink>
      </section>
    );
  }
  return (
    <section className="space-y-5">
      <div className="space-y-1">
        <h1 className="text-display font-bold leading-tight text-ink">Join {invite.farmName}</h1>
        <p className="text-ink-soft">
          You are invited as <strong className="text-ink">{vocabularyLabels.role[invite.role]}</strong>. {roleSummary[invite.role]}
        </p>
      </div>
      <AcceptInviteForm token={token} email={invite.email} existingAccount={invite.existingAccount} />
    </section>
  );
}
