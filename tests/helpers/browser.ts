import { mkdirSync } from "node:fs";
import { join } from "node:path";
import { chromium, type Browser, type Page } from "playwright-core";

export const BASE_URL = process.env.E2E_BASE_URL ?? "http://localhost:3100";
export const DEMO_PASSWORD = "tidemark-demo";
export const ARTIFACTS = join(process.cwd(), "tests/artifacts/screenshots");

/** Debian's Chromium, headless; playwright gives it a fresh profile. Never a downloaded browser. */
export async function launchBrowser(): Promise<Browser> {
  mkdirSync(ARTIFACTS, { recursive: true });
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
    args: [
      "--headless",
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
    ],
  });
}

/** Signs in through the real form, as a person would, using only the keyboard. */
export async function signInThroughForm(
  page: Page,
  email: string,
  password = DEMO_PASSWORD,
): Promise<void> {
  await page.goto(`${BASE_URL}/sign-in`);
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByLabel("Password").press("Enter");
}
