import type { Metadata } from "next";
import { Suspense } from "react";
import { NewBagForm } from "@/components/bags/NewBagForm";

export const metadata: Metadata = { title: "New bag" };

// The lot can come in the query (?lot=…), read on the phone so the page stays static and opens offline.
export default function NewBagPage() {
  return (
    <Suspense>
      <NewBagForm />
    </Suspense>
  );
}
