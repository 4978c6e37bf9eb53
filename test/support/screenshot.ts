// Developer aid: `npx tsx test/support/screenshot.ts URL NAME` writes test/.artifacts/NAME-{phone,tablet,desktop}.png.
import { mkdirSync } from "node:fs";
import { launchBrowser, VIEWPORTS } from "./browser";

const [url, name = "page", cookie] = process.argv.slice(2);
mkdirSync("test/.artifacts", { recursive: true });
const browser = await launchBrowser();
try {
  for (const [kind, viewport] of Object.entries(VIEWPORTS)) {
    const context = await browser.newContext({ viewport });
    if (cookie) {
      const [key, value] = cookie.split("=");
      // for the whole site, so the page's own /api requests are signed in too
      await context.addCookies([{ name: key, value, domain: new URL(url).hostname, path: "/" }]);
    }
    const page = await context.newPage();
    await page.goto(url, { waitUntil: "networkidle" });
    await page.screenshot({ path: `test/.artifacts/${name}-${kind}.png`, fullPage: true });
    await context.close();
  }
} finally {
  await browser.close();
}
