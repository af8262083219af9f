import fs from "node:fs"; import os from "node:os"; import path from "node:path";
import { chromium } from "playwright-core";
import { serve } from "./server.mjs";
const rows = Number(process.argv[2] || 1000000);
const server = await serve(path.resolve("../../dist"));
const base = `http://127.0.0.1:${server.address().port}/`;
const ctx = await chromium.launchPersistentContext(fs.mkdtempSync(path.join(os.tmpdir(), "rc-")), {
  executablePath: "/usr/bin/chromium", headless: true,
  args: ["--headless","--no-sandbox","--disable-gpu","--disable-background-networking","--disable-component-update","--disable-sync","--no-first-run"],
  viewport: { width: 1280, height: 900 } });
const page = await ctx.newPage();
page.on("pageerror", e => console.log("ERR", String(e))); page.on("console", m => { if (m.text().startsWith("T ")) console.log(Date.now(), m.text()); });
await page.goto(base + (process.argv[3] ? "?workers=" + process.argv[3] : ""));
await page.waitForSelector("#run:not([disabled])");
let csv = "y,g\n";
for (let i = 0; i < rows; i++) csv += `${(10 + ((i * 7919) % 1000) / 250).toFixed(4)},a\n${(10.01 + ((i * 6007) % 1000) / 250).toFixed(4)},b\n`;
let t0 = Date.now();
await page.evaluate((text) => { const t = document.querySelector("#data"); t.value = text; t.dispatchEvent(new Event("input", { bubbles: true })); }, csv);
await page.waitForFunction((r) => document.querySelector("#preview")?.textContent.includes("rows"), rows, { timeout: 600000 });
console.log("preview after", (Date.now() - t0) / 1000, "s");
await page.click("details:has(#seed) > summary");
await page.fill("#seed", "7");
t0 = Date.now();
console.log("click", Date.now()); await page.click("#run");
let last = "";
for (;;) {
  const done = await page.$("#finding");
  const st = await page.evaluate(() => document.querySelector("#run-status, .progress, [role=progressbar]")?.textContent || "");
  if (st !== last) { console.log(((Date.now()-t0)/1000).toFixed(1), st.slice(0, 150)); last = st; }
  if (done) break;
  await new Promise(r => setTimeout(r, 1000));
  if (Date.now() - t0 > 600000) break;
}
console.log("finding after", (Date.now() - t0) / 1000, "s");
console.log((await page.textContent("#finding")) || "none");
const m = (await page.textContent("#findings")).match(/It ran in[^.]*\./); console.log(m && m[0]);
console.log(await page.getAttribute("#findings", "data-p-value"), await page.getAttribute("#findings", "data-ci-low"));
await page.screenshot({ path: "/tmp/e2e/big.png", fullPage: false });
await ctx.close(); server.close();
