// Renders Rimebook's own SVG icons (public/icons/*.svg) to the PNG sizes the web app manifest lists,
// with the system Chromium. Run after changing the mark: node sw/render-icons.mjs
import fs from "node:fs";
import path from "node:path";
import { chromium } from "playwright-core";

const dir = path.resolve("public/icons");
const jobs = [
  ["rimebook.svg", "rimebook-192.png", 192],
  ["rimebook.svg", "rimebook-512.png", 512],
  ["rimebook.svg", "apple-touch-icon.png", 180],
  ["rimebook-maskable.svg", "rimebook-maskable-512.png", 512],
];

const browser = await chromium.launch({
  executablePath: "/usr/bin/chromium",
  args: ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"],
});
try {
  for (const [svg, png, size] of jobs) {
    const page = await browser.newPage({ viewport: { width: size, height: size } });
    const markup = fs.readFileSync(path.join(dir, svg), "utf8").replace(/width="\d+" height="\d+"/, `width="${size}" height="${size}"`);
    await page.setContent(`<html><body style="margin:0;background:transparent">${markup}</body></html>`);
    await page.locator("svg").screenshot({ path: path.join(dir, png), omitBackground: true });
    await page.close();
    console.log(`${png} ${size}×${size}`);
  }
} finally {
  await browser.close();
}
