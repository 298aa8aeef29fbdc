import type { Metadata } from "next";
import { StoresScreen } from "@/components/stores/StoresScreen";

export const metadata: Metadata = { title: "Cold stores" };

export default function StoresPage() {
  return <StoresScreen />;
}
