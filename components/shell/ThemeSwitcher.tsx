"use client";

import { Radio, RadioGroup } from "@headlessui/react";
import { useState } from "react";
import { IconMonitor, IconMoon, IconSun } from "@/components/ui/icons";
import { THEME_COOKIE, type ThemeChoice } from "@/lib/preferences/theme";

const OPTIONS: { value: ThemeChoice; label: string; Icon: typeof IconSun }[] = [
  { value: "system", label: "System", Icon: IconMonitor },
  { value: "day", label: "Day", Icon: IconSun },
  { value: "night", label: "Night", Icon: IconMoon },
];

/** Day, night, or follow the device; applied at once, remembered in a cookie. */
export function ThemeSwitcher({ value }: { value: ThemeChoice }) {
  const [theme, setTheme] = useState(value);
  const choose = (next: ThemeChoice) => {
    setTheme(next);
    document.cookie = `${THEME_COOKIE}=${next}; path=/; max-age=31536000; samesite=lax`;
    if (next === "system") delete document.documentElement.dataset.theme;
    else document.documentElement.dataset.theme = next;
  };
  return (
    <RadioGroup
      value={theme}
      onChange={choose}
      aria-label="Theme"
      className="flex rounded-md border border-border p-0.5"
    >
      {OPTIONS.map(({ value: v, label, Icon }) => (
        <Radio
          key={v}
          value={v}
          aria-label={`${label} theme`}
          title={`${label} theme`}
          className="flex cursor-pointer items-center rounded px-1.5 py-1 text-ink-muted data-[checked]:bg-accent-soft data-[checked]:text-accent-strong data-[focus]:outline-2 data-[focus]:outline-focus"
        >
          <Icon />
        </Radio>
      ))}
    </RadioGroup>
  );
}
