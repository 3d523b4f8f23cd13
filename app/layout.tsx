import type { Metadata, Viewport } from "next";
import localFont from "next/font/local";
import { ThemeScript } from "@/components/shell/theme-script";
import "./globals.css";

const sans = localFont({ src: "./fonts/geist-sans.woff2", variable: "--font-sans", display: "swap", weight: "100 900" });
const mono = localFont({ src: "./fonts/geist-mono.woff2", variable: "--font-mono", display: "swap", weight: "100 900" });

export const metadata: Metadata = {
  title: { default: "Peeksafe", template: "%s · Peeksafe" },
  description: "Campaign lift against a randomized holdout, with statistics that stay valid however often you look.",
};

export const viewport: Viewport = { width: "device-width", initialScale: 1 };

export default function RootLayout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en" className={`${sans.variable} ${mono.variable}`} suppressHydrationWarning>
      <head>
        <ThemeScript />
      </head>
      <body className="min-h-screen font-sans">{children}</body>
    </html>
  );
}
