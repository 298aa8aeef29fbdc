import type { Metadata } from "next";
import { BagsTable } from "@/components/bags/BagsTable";

export const metadata: Metadata = { title: "Bags" };

export default function BagsPage() {
  return <BagsTable />;
}
