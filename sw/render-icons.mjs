// Renders Rimebook's own SVG icons (public/icons/*.svg) to the PNG sizes the web app manifest lists,
// with the system Chromium, and app/favicon.ico (browsers ask for /favicon.ico on every fresh profile).
// Run after changing the mark: node sw/render-icons.mjs
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
  // An ICO file holding PNG images (allowed since Windows Vista; every current browser reads it): 16, 32, 48 px.
  const sizes = [16, 32, 48];
  const pngs = [];
  for (const size of sizes) {
    const page = await browser.newPage({ viewport: { width: size, height: size } });
    const markup = fs.readFileSync(path.join(dir, "rimebook.svg"), "utf8").replace(/width="\d+" height="\d+"/, `width="${size}" height="${size}"`);
    await page.setContent(`<html><body style="margin:0;background:transparent">${markup}</body></html>`);
    pngs.push(await page.locator("svg").screenshot({ omitBackground: true }));
    await page.close();
  }
  const header = Buffer.alloc(6 + 16 * sizes.length);
  header.writeUInt16LE(0, 0); // reserved
  header.writeUInt16LE(1, 2); // 1 = icon
  header.writeUInt16LE(sizes.length, 4);
  let offset = header.length;
  sizes.forEach((size, i) => {
    const e = 6 + 16 * i;
    header.writeUInt8(size, e); // width
    header.writeUInt8(size, e + 1); // height
    header.writeUInt16LE(1, e + 4); // colour planes
    header.writeUInt16LE(32, e + 6); // bits per pixel
    header.writeUInt32LE(pngs[i].length, e + 8);
    header.writeUInt32LE(offset, e + 12);
    offset += pngs[i].length;
  });
  fs.writeFileSync(path.resolve("app/favicon.ico"), Buffer.concat([header, ...pngs]));
  console.log(`favicon.ico ${sizes.join(", ")} px`);
} finally {
  await browser.close();
}
