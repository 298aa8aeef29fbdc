import type { Metadata } from "next";
import { Suspense } from "react";
import { ProtocolView } from "@/components/protocols/ProtocolView";

export const metadata: Metadata = { title: "Protocol" };

// One static route (/protocols/view?id=…) so every protocol opens offline.
export default function ProtocolViewPage() {
  return (
    <Suspense>
      <ProtocolView />
    </Suspense>
  );
}
