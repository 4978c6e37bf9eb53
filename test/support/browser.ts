// Debian's chromium driven by playwright-core (no browser download: see STACK.md).
import { execFileSync } from "node:child_process";
import { chromium, type Browser } from "playwright-core";

export const VIEWPORTS = {
  phone: { width: 390, height: 844 },
  tablet: { width: 820, height: 1180 },
  desktop: { width: 1440, height: 900 },
} as const;

export function chromiumPath(): string {
  if (process.env.CHROMIUM_PATH) return process.env.CHROMIUM_PATH;
  try {
    return execFileSync("sh", ["-c", "command -v chromium || command -v chromium-browser"], { encoding: "utf8" }).trim();
  } catch {
    throw new Error("chromium is not installed; bin/test installs it (apt-get install chromium)");
  }
}

export function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: chromiumPath(),
    headless: true,
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

/** Signs in through the real form, then lands on `to` (the form's return address). */
export async function signInThroughForm(page: import("playwright-core").Page, appUrl: string, user: { email: string; password: string }, to = "/") {
  await page.goto(`${appUrl}/sign-in?redirectTo=${encodeURIComponent(to)}`);
  await page.getByLabel("E-mail").fill(user.email);
  await page.getByLabel("Password").fill(user.password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL((url) => url.pathname === to.split("?")[0]);
}
