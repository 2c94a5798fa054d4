import type { Config } from "tailwindcss";
import plugin from "tailwindcss/plugin";

/**
 * Tidemark's own palette. Named after the sea the product is named for:
 * "tide" (deep blue-teal, the brand and links), "kelp" (in band), "ember"
 * (below band), "sky" (above band on oxygen), "amber" (overdue), "slate" for
 * surfaces. Status always pairs a colour with a word and an icon.
 */
const palette = {
  tide: {
    50: "#eef7f8",
    100: "#d4ebee",
    200: "#a9d6dd",
    300: "#73b9c4",
    400: "#3f96a5",
    500: "#1f7a8b",
    600: "#176374",
    700: "#15505e",
    800: "#14404b",
    900: "#10323b",
    950: "#081d23",
  },
  slate: {
    50: "#f6f7f9",
    100: "#eceef2",
    200: "#d5dae2",
    300: "#b1b9c6",
    400: "#8791a3",
    500: "#677286",
    600: "#525b6d",
    700: "#434a59",
    800: "#2c313c",
    850: "#222730",
    900: "#1a1e25",
    950: "#111418",
  },
  kelp: { 100: "#dcf2e3", 300: "#86cf9f", 500: "#2e8b57", 700: "#1d5e3a", 900: "#123a25" },
  ember: { 100: "#fbe3de", 300: "#f0a091", 500: "#c2412d", 700: "#8f2c1d", 900: "#521a11" },
  sky: { 100: "#e0ecfb", 300: "#93b9ec", 500: "#3a6fc4", 700: "#284f8d", 900: "#172e52" },
  amber: { 100: "#fbefd3", 300: "#eec46a", 500: "#b7800f", 700: "#7f580a", 900: "#4a3306" },
} as const;

type Rgbish = string;
export const day: Record<string, Rgbish> = {
  "--tm-canvas": palette.slate[50],
  "--tm-surface": "#ffffff",
  "--tm-surface-muted": palette.slate[100],
  "--tm-border": palette.slate[200],
  "--tm-border-strong": palette.slate[400],
  "--tm-ink": palette.slate[950],
  "--tm-ink-muted": palette.slate[600],
  "--tm-accent": palette.tide[600],
  "--tm-accent-strong": palette.tide[700],
  "--tm-accent-soft": palette.tide[50],
  "--tm-on-accent": "#ffffff",
  "--tm-focus": palette.tide[500],
  "--tm-in-band": palette.kelp[700],
  "--tm-in-band-soft": palette.kelp[100],
  "--tm-below": palette.ember[700],
  "--tm-below-soft": palette.ember[100],
  "--tm-above": palette.sky[700],
  "--tm-above-soft": palette.sky[100],
  "--tm-overdue": palette.amber[700],
  "--tm-overdue-soft": palette.amber[100],
};
// Night: dim, low-glare surfaces for darkened wards; every pair keeps WCAG AA.
export const night: Record<string, Rgbish> = {
  "--tm-canvas": palette.slate[950],
  "--tm-surface": palette.slate[900],
  "--tm-surface-muted": palette.slate[850],
  "--tm-border": palette.slate[800],
  "--tm-border-strong": palette.slate[600],
  "--tm-ink": palette.slate[100],
  "--tm-ink-muted": palette.slate[300],
  "--tm-accent": palette.tide[300],
  "--tm-accent-strong": palette.tide[200],
  "--tm-accent-soft": palette.tide[950],
  "--tm-on-accent": palette.tide[950],
  "--tm-focus": palette.tide[300],
  "--tm-in-band": palette.kelp[300],
  "--tm-in-band-soft": palette.kelp[900],
  "--tm-below": palette.ember[300],
  "--tm-below-soft": palette.ember[900],
  "--tm-above": palette.sky[300],
  "--tm-above-soft": palette.sky[900],
  "--tm-overdue": palette.amber[300],
  "--tm-overdue-soft": palette.amber[900],
};

const semantic = Object.fromEntries(
  Object.keys(day).map((name) => [name.replace("--tm-", ""), `var(${name})`]),
);

const config: Config = {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: { ...palette, ...semantic },
      fontFamily: {
        sans: ["var(--font-inter)", "system-ui", "sans-serif"],
        mono: ["var(--font-mono)", "ui-monospace", "monospace"],
      },
      // A compact clinical type scale: dense tables, clear headings.
      fontSize: {
        "2xs": ["0.6875rem", { lineHeight: "1rem" }],
        xs: ["0.75rem", { lineHeight: "1.05rem" }],
        sm: ["0.8125rem", { lineHeight: "1.2rem" }],
        base: ["0.875rem", { lineHeight: "1.35rem" }],
        lg: ["1rem", { lineHeight: "1.5rem" }],
        xl: ["1.25rem", { lineHeight: "1.75rem" }],
        "2xl": ["1.5rem", { lineHeight: "2rem" }],
        value: ["1.375rem", { lineHeight: "1.6rem", fontWeight: "600" }],
      },
      borderRadius: { card: "0.625rem" },
      boxShadow: { card: "0 1px 2px rgb(16 24 32 / 0.06), 0 1px 1px rgb(16 24 32 / 0.04)" },
    },
  },
  plugins: [
    plugin((api) => {
      api.addBase({
        ":root": { ...day, colorScheme: "light" },
        "@media (prefers-color-scheme: dark)": {
          ":root:not([data-theme='day'])": { ...night, colorScheme: "dark" },
        },
        ":root[data-theme='night']": { ...night, colorScheme: "dark" },
      });
    }),
  ],
};

export default config;
