import { describe, expect, it } from "vitest";
import { day, night } from "@/tailwind.config";

// WCAG 2.1, success criterion 1.4.3 (contrast minimum) and the definitions of
// relative luminance and contrast ratio: text needs 4.5:1 against its background.
function luminance(hex: string): number {
  const channels = [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16) / 255);
  const [r, g, b] = channels.map((c) =>
    c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4,
  ) as [number, number, number];
  return 0.2126 * r + 0.7152 * g + 0.0722 * b;
}

function contrast(a: string, b: string): number {
  const [hi, lo] = [luminance(a), luminance(b)].sort((x, y) => y - x) as [number, number];
  return (hi + 0.05) / (lo + 0.05);
}

// Text colour on the background it is drawn on, as the components pair them.
const PAIRS: [string, string][] = [
  ["--tm-ink", "--tm-canvas"],
  ["--tm-ink", "--tm-surface"],
  ["--tm-ink", "--tm-surface-muted"],
  ["--tm-ink-muted", "--tm-surface"],
  ["--tm-ink-muted", "--tm-surface-muted"],
  ["--tm-ink-muted", "--tm-canvas"],
  ["--tm-accent", "--tm-surface"],
  ["--tm-accent-strong", "--tm-accent-soft"],
  ["--tm-on-accent", "--tm-accent"],
  ["--tm-in-band", "--tm-in-band-soft"],
  ["--tm-below", "--tm-below-soft"],
  ["--tm-below", "--tm-surface"],
  ["--tm-above", "--tm-above-soft"],
  ["--tm-overdue", "--tm-overdue-soft"],
];

describe.each([
  ["day", day],
  ["night", night],
])("%s theme meets WCAG AA for text", (_name, theme) => {
  it.each(PAIRS)("%s on %s is at least 4.5:1", (fg, bg) => {
    expect(contrast(theme[fg]!, theme[bg]!)).toBeGreaterThanOrEqual(4.5);
  });
});

describe("contrast formula", () => {
  it("gives 21:1 for black on white and 1:1 for a colour on itself (WCAG 2.1 definition)", () => {
    expect(contrast("#000000", "#ffffff")).toBeCloseTo(21, 5);
    expect(contrast("#1f7a8b", "#1f7a8b")).toBeCloseTo(1, 10);
  });
});
