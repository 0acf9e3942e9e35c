import type { Metadata, Viewport } from "next";
import type { ReactNode } from "react";
import "./globals.css";
import { TopBar } from "@/components/shell/TopBar";
import { HydrationMark } from "@/components/shell/HydrationMark";

export const metadata: Metadata = {
  title: { default: "Quell", template: "%s · Quell" },
  description: "Design, check and share op-amp-driven linear current sources and sinks.",
};

export const viewport: Viewport = { width: "device-width", initialScale: 1 };

export default function RootLayout({ children }: { children: ReactNode }) {
  return (
    <html lang="en">
      <body className="min-h-screen font-sans antialiased">
        <HydrationMark />
        <TopBar />
        {children}
      </body>
    </html>
  );
}
