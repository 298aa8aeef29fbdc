import type { Metadata } from "next";
import { Suspense } from "react";
import { TrialView } from "@/components/trials/TrialView";

export const metadata: Metadata = { title: "Trial" };

// Static route reading ?id= on the phone: precached, so a trial opens with no signal.
export default function TrialViewPage() {
  return (
    <Suspense fallback={<p className="p-4 text-ink-soft">Opening the trial…</p>}>
      <TrialView />
    </Suspense>
  );
}
