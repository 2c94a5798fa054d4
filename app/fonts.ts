import localFont from "next/font/local";

// Shipped inside the repository (SIL Open Font License, see app/fonts/); no download at build time.
export const inter = localFont({
  src: "./fonts/inter-latin-wght.woff2",
  variable: "--font-inter",
  weight: "100 900",
  display: "swap",
});

export const mono = localFont({
  src: "./fonts/jetbrains-mono-latin-wght.woff2",
  variable: "--font-mono",
  weight: "100 800",
  display: "swap",
});
