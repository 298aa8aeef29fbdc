import type { Metadata } from "next";
import { Suspense } from "react";
import { SowingScreen } from "@/components/counts/SowingScreen";

export const metadata: Metadata = { title: "Sowing and counts" };

// Static route; the bag comes from ?bag= on the phone, so it is precached and counts work with no signal.
export default function SowingPage() {
  return (
    <Suspense fallback={<p className="p-4 text-ink-soft">Opening…</p>}>
      <SowingScreen />
    </Suspense>
  );
}
