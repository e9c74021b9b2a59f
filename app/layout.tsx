import type { Metadata, Viewport } from "next";
import localFont from "next/font/local";
import { connection } from "next/server";
import "./globals.css";

// Barlow ships with the app: no font is fetched from the network.
const barlow = localFont({
  src: [
    { path: "../fonts/barlow-latin-400-normal.woff2", weight: "400", style: "normal" },
    { path: "../fonts/barlow-latin-500-normal.woff2", weight: "500", style: "normal" },
    { path: "../fonts/barlow-latin-600-normal.woff2", weight: "600", style: "normal" },
    { path: "../fonts/barlow-latin-700-normal.woff2", weight: "700", style: "normal" },
  ],
  variable: "--font-barlow",
  display: "swap",
});

export const metadata: Metadata = {
  title: { default: "Airtally", template: "%s · Airtally" },
  description: "Airflow commissioning: traverses, density-corrected flows, continuity and signed closeout reports.",
  icons: { icon: "/icon.svg" },
  // Project data is private: keep the app out of search engines.
  robots: { index: false, follow: false },
};

export const viewport: Viewport = {
  width: "device-width",
  initialScale: 1,
  themeColor: "#111a22",
};

export default async function RootLayout({ children }: { children: React.ReactNode }) {
  // Every page renders per request: proxy.ts gives each response a fresh CSP nonce, which a
  // prerendered page could not carry.
  await connection();
  return (
    <html lang="en" className={barlow.variable}>
      <body>{children}</body>
    </html>
  );
}
