import type { Metadata } from "next";
import { Suspense } from "react";
import { BagDetail } from "@/components/bags/BagDetail";

export const metadata: Metadata = { title: "Bag" };

// One static route for every bag (/bags/view?id=…): the service worker keeps it, so a bag opens with no signal.
export default function BagViewPage() {
  return (
    <Suspense>
      <BagDetail />
    </Suspense>
  );
}
