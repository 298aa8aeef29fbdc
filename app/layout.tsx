import type { Metadata, Viewport } from "next";
import "./globals.css";
import { figtree } from "./fonts";
import { ServiceWorkerRegistration } from "@/components/shell/ServiceWorkerRegistration";

export const metadata: Metadata = {
  title: { default: "Rimebook", template: "%s · Rimebook" },
  description: "Cold-moist stratification records for growers: plan, label, check, pull, sow and count, with or without signal.",
  applicationName: "Rimebook",
};

export const viewport: Viewport = {
  width: "device-width",
  initialScale: 1,
  themeColor: "#1f4d6c",
};

export default function RootLayout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en" className={figtree.variable}>
      <body className="min-h-dvh font-sans antialiased">
        {children}
        <ServiceWorkerRegistration />
      </body>
    </html>
  );
}
