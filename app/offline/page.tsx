import type { Metadata } from "next";
import Link from "next/link";
import { RimeMark } from "@/components/ui/RimeMark";

export const metadata: Metadata = { title: "No signal" };

// Shown by the service worker when a page was never stored on this phone and there is no signal.
export default function OfflinePage() {
  return (
    <main className="mx-auto flex min-h-dvh max-w-xl flex-col items-start gap-5 px-5 py-10">
      <RimeMark className="h-12 w-12" />
      <h1 className="text-title font-semibold">No signal here</h1>
      <p className="text-ink-soft">
        This page is not stored on this phone yet. Everything you record is kept on the phone and sent when the
        signal returns. Today&apos;s round, scanning and checks work without a connection.
      </p>
      <Link href="/today" className="flex min-h-tap items-center rounded-card bg-glacier-700 px-5 py-3 font-semibold text-white">
        Go to today&apos;s round
      </Link>
    </main>
  );
}
