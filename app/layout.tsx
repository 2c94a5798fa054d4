import type { Metadata, Viewport } from "next";
import { cookies } from "next/headers";
import type { ReactNode } from "react";
import { parseTheme, THEME_COOKIE } from "@/lib/preferences/theme";
import { inter, mono } from "./fonts";
import "./globals.css";

export const metadata: Metadata = {
  title: { default: "Tidemark", template: "%s · Tidemark" },
  description: "Oxygen and ventilation order ledger for hospital care teams",
};

export const viewport: Viewport = {
  themeColor: [
    { media: "(prefers-color-scheme: light)", color: "#f6f7f9" },
    { media: "(prefers-color-scheme: dark)", color: "#111418" },
  ],
};

export default async function RootLayout({ children }: { children: ReactNode }) {
  const theme = parseTheme((await cookies()).get(THEME_COOKIE)?.value);
  return (
    <html
      lang="en"
      className={`${inter.variable} ${mono.variable}`}
      {...(theme === "system" ? {} : { "data-theme": theme })}
    >
      <body>{children}</body>
    </html>
  );
}
