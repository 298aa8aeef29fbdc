import type { Metadata } from "next";
import { AppShell } from "@/components/shell/AppShell";

// Static on purpose: the service worker precaches each farm screen, and who is signed in comes from
// the phone store (lib/client), so every screen opens with no signal.
export const metadata: Metadata = {
  icons: { icon: "/icons/rimebook.svg", apple: "/icons/apple-touch-icon.png" },
};

export default function FarmLayout({ children }: { children: React.ReactNode }) {
  return <AppShell>{children}</AppShell>;
}
