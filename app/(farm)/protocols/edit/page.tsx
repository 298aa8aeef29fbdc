import type { Metadata } from "next";
import { Suspense } from "react";
import { ProtocolForm } from "@/components/protocols/ProtocolForm";

export const metadata: Metadata = { title: "Edit protocol" };

// New protocol at /protocols/edit, the farm's own at /protocols/edit?id=… (static, so it opens offline).
export default function ProtocolEditPage() {
  return (
    <Suspense>
      <ProtocolForm />
    </Suspense>
  );
}
