import type { Metadata } from "next";
import type { ReactNode } from "react";
import { plexMono, plexSans } from "./fonts";
import "./globals.css";

export const metadata: Metadata = {
  title: { default: "Counterpoise", template: "%s · Counterpoise" },
  description: "Balancing workbench for engine machine shops",
};

export default function RootLayout({ children }: { children: ReactNode }) {
  return (
    <html lang="en" className={`${plexSans.variable} ${plexMono.variable}`}>
      <body className="min-h-screen font-sans">{children}</body>
    </html>
  );
}
