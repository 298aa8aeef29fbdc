import Link from "next/link";
import { RimeMark } from "@/components/ui/RimeMark";

// Signed-out landing page. The farm's own screens live under app/(farm).
export default function LandingPage() {
  return (
    <main className="mx-auto flex min-h-dvh max-w-xl flex-col gap-8 px-5 py-10">
      <header className="flex items-center gap-3">
        <RimeMark className="h-11 w-11" />
        <span className="text-display font-bold tracking-tight text-glacier-800">Rimebook</span>
      </header>

      <section className="space-y-4">
        <h1 className="text-title font-semibold leading-snug">
          Every bag of seed through its winter, on time, with a record you can trust.
        </h1>
        <p className="text-ink-soft">
          Plan which species need cold, label each bag with a code your phone reads, record a check with one tap at
          the fridge even without signal, keep an eye on the cold itself, and count what comes up. Your whole team
          sees the same round.
        </p>
      </section>

      <div className="flex flex-col gap-3">
        <Link
          href="/sign-in"
          className="flex min-h-tap items-center justify-center rounded-card bg-glacier-700 px-5 py-3 text-body font-semibold text-white hover:bg-glacier-800"
        >
          Sign in
        </Link>
        <Link
          href="/sign-up"
          className="flex min-h-tap items-center justify-center rounded-card border-2 border-glacier-700 px-5 py-3 text-body font-semibold text-glacier-700 hover:bg-rime-100"
        >
          Start a farm account
        </Link>
      </div>

      <aside className="rounded-card border border-rime-200 bg-paper p-4 text-label text-ink-soft">
        <strong className="text-ink">Keep seed apart from food.</strong> Seal and label every bag, box it away from food
        and out of reach of children: some seeds are toxic and treated seed is poisonous. Follow local rules and your
        seed supplier&apos;s guidance.
      </aside>
    </main>
  );
}
