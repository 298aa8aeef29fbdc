import type { Metadata } from "next";
import { TrialsScreen } from "@/components/trials/TrialsScreen";

export const metadata: Metadata = { title: "Trials" };

export default function TrialsPage() {
  return <TrialsScreen />;
}
