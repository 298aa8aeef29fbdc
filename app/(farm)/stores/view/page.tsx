import type { Metadata } from "next";
import { Suspense } from "react";
import { StoreView } from "@/components/stores/StoreView";

export const metadata: Metadata = { title: "Cold store" };

// A static route that reads ?id= on the phone, so the service worker can precache it and it opens with no signal.
export default function StoreViewPage() {
  return (
    <Suspense fallback={<p className="p-4 text-ink-soft">Opening the store…</p>}>
      <StoreView />
    </Suspense>
  );
}
