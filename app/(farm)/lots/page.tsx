import type { Metadata } from "next";
import { LotsList } from "@/components/lots/LotsList";

export const metadata: Metadata = { title: "Seed lots" };

export default function LotsPage() {
  return <LotsList />;
}
