import type { Metadata } from "next";
import localFont from "next/font/local";
import type { ReactNode } from "react";
import { ZodJitless } from "@/components/shell/ZodJitless";
import "./globals.css";

const inter = localFont({ src: "./fonts/inter-latin-wght.woff2", variable: "--font-inter", display: "swap" });
const mono = localFont({ src: "./fonts/jetbrains-mono-latin-wght.woff2", variable: "--font-mono", display: "swap" });

export const metadata: Metadata = {
  title: { default: "Tessera", template: "%s · Tessera" },
  description: "Live localisation, dispatch and safety holds for indoor robot fleets on a tiled floor.",
};

export default function RootLayout({ children }: { children: ReactNode }) {
  return (
    <html lang="en" className={`dark ${inter.variable} ${mono.variable}`}>
      <body className="font-sans">
        <ZodJitless />
        {children}
      </body>
    </html>
  );
}
