export const THEME_COOKIE = "tm-theme";
export const THEMES = ["system", "day", "night"] as const;
export type ThemeChoice = (typeof THEMES)[number];

export function parseTheme(value: string | undefined): ThemeChoice {
  return (THEMES as readonly string[]).includes(value ?? "") ? (value as ThemeChoice) : "system";
}
