// The accessibility audit: axe-core (npm, the version in package.json) run on every step and
// design of the built page, light and dark, and on findings marked as belonging to an earlier
// input. No finding of serious or critical impact is allowed. Also: findings stay marked as
// not current after the data or a setting changes and after a run that fails or is stopped.
import { test, before, after } from "node:test";
import assert from "node:assert/strict";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { createRequire } from "node:module";
import { fileURLToPath } from "node:url";
import { chromium } from "playwright-core";
import { serve } from "./server.mjs";

const here = path.dirname(fileURLToPath(import.meta.url));
const dist = path.resolve(here, "../../dist");
const out = path.join(here, "out");
fs.mkdirSync(out, { recursive: true });
const axePath = createRequire(import.meta.url).resolve("axe-core/axe.min.js");

let server, base, context;

before(async () => {
  assert.ok(fs.existsSync(path.join(dist, "index.html")), "dist/index.html missing: run trunk build --release first");
  server = await serve(dist);
  base = `http://127.0.0.1:${server.address().port}/`;
  const chromiumPath = [process.env.CHROMIUM, "/usr/bin/chromium", "/usr/bin/chromium-browser"].find((p) => p && fs.existsSync(p));
  context = await chromium.launchPersistentContext(fs.mkdtempSync(path.join(os.tmpdir(), "reshuffle-audit-")), {
    executablePath: chromiumPath,
    headless: true,
    args: [
      "--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking",
      "--disable-component-update", "--disable-sync", "--no-first-run",
    ],
    viewport: { width: 1280, height: 900 },
    // The page's Content-Security-Policy allows only its own scripts; the audit script is
    // injected by the test, so only this context lets it in.
    bypassCSP: true,
  });
});

after(async () => {
  await context?.close();
  server?.close();
});

async function openPage(colorScheme = "light") {
  const page = await context.newPage();
  const errors = [];
  page.on("pageerror", (e) => errors.push(String(e)));
  await page.emulateMedia({ colorScheme });
  await page.goto(base);
  await page.waitForSelector("#run:not([disabled])", { timeout: 30000 });
  return { page, errors };
}

// Runs axe on the page as it is and fails on any serious or critical finding, naming the
// rule, the element and axe's advice.
async function audit(page, where) {
  if (!(await page.evaluate(() => typeof window.axe !== "undefined"))) {
    await page.addScriptTag({ path: axePath });
  }
  const result = await page.evaluate(async () => {
    const r = await window.axe.run(document, { resultTypes: ["violations"] });
    return r.violations.map((v) => ({
      id: v.id,
      impact: v.impact,
      help: v.help,
      nodes: v.nodes.slice(0, 3).map((n) => `${n.target.join(" ")}: ${n.failureSummary}`),
    }));
  });
  const bad = result.filter((v) => v.impact === "serious" || v.impact === "critical");
  assert.deepEqual(bad, [], `${where}: ${JSON.stringify(bad, null, 2)}`);
  return result;
}

async function runAndWait(page) {
  await page.click("#run");
  await page.waitForSelector("#finding", { timeout: 60000 });
}

async function seed(page, s) {
  if (!(await page.isVisible("#seed"))) await page.click("details:has(#seed) > summary");
  await page.fill("#seed", String(s));
}

for (const scheme of ["light", "dark"]) {
  test(`every step and design passes the accessibility audit (${scheme})`, async () => {
    const { page, errors } = await openPage(scheme);
    await audit(page, `${scheme}: the page as opened`);
    await seed(page, 5);
    await audit(page, `${scheme}: settings open`);
    await runAndWait(page);
    await audit(page, `${scheme}: two groups, findings`);
    await page.screenshot({ path: path.join(out, `audit-${scheme}.png`), fullPage: true });
    for (const [example, design] of [["desks", null], ["adhesives", "k-groups"], ["coatings", "stratified"], ["seeds", "yes-no"]]) {
      await page.selectOption("#example", example);
      if (design) await page.waitForFunction((d) => document.querySelector("#design").value === d, design);
      await audit(page, `${scheme}: example ${example}, form`);
      await runAndWait(page);
      await audit(page, `${scheme}: example ${example}, findings`);
    }
    // The designs without an example of their own: their forms.
    await page.selectOption("#example", "desks");
    for (const design of ["paired", "one-sample", "association"]) {
      await page.selectOption("#design", design);
      await audit(page, `${scheme}: ${design} form`);
    }
    await page.check("#mode-estimate");
    await audit(page, `${scheme}: estimate form`);
    await page.check("#mode-plan");
    await audit(page, `${scheme}: plan form`);
    assert.deepEqual(errors, []);
    await page.close();
  });
}

test("findings of an earlier input are marked, also after a failed or stopped run", async () => {
  const { page, errors } = await openPage();
  await seed(page, 11);
  await runAndWait(page);
  const finding = await page.textContent("#finding");
  const staleShown = () => page.evaluate(() => !!document.querySelector("#stale-note") && !!document.querySelector(".findings-wrap.is-stale"));
  assert.equal(await staleShown(), false, "fresh findings are not marked");
  // A setting changes: marked; changed back: current again.
  await page.fill("#bootstrap", "2000");
  assert.equal(await staleShown(), true, "marked after a setting changed");
  await page.fill("#bootstrap", "10000");
  assert.equal(await staleShown(), false, "current again once the setting is back");
  // The data no longer read as a table with these columns: marked, and the text is kept.
  const original = await page.inputValue("#data");
  await page.fill("#data", "");
  assert.equal(await staleShown(), true, "marked when the data box is emptied");
  await page.fill("#data", original);
  assert.equal(await staleShown(), false);
  // A run that fails in the worker (a value that is not a number): the findings on screen
  // are the earlier ones, so they are marked, and the text is kept.
  const broken = original.replace(/\n(\d+\.\d+),/, "\n4.l,");
  assert.notEqual(broken, original);
  await page.fill("#data", broken);
  await page.click("#run");
  await page.waitForSelector("#run-error", { timeout: 30000 });
  assert.equal(await staleShown(), true, "marked after a failed run");
  assert.equal(await page.textContent("#finding"), finding, "the earlier findings are still readable");
  assert.equal(await page.inputValue("#data"), broken);
  await audit(page, "stale findings");
  await page.screenshot({ path: path.join(out, "stale.png"), fullPage: true });
  // A long run that is stopped: still marked.
  await page.fill("#data", original);
  await page.fill("#resamples", "10000000");
  await page.selectOption("#statistic", "median-difference");
  await page.click("#run");
  await page.waitForSelector("#progress", { timeout: 30000 });
  await page.click("#stop");
  await page.waitForFunction(() => /Stopped/.test(document.querySelector("#status")?.textContent || ""));
  assert.equal(await staleShown(), true, "marked after a stopped run with other settings");
  assert.deepEqual(errors, []);
  await page.close();
});

test("the main controls are reached with the Tab key alone, and Enter runs the analysis", async () => {
  const { page, errors } = await openPage();
  const reached = new Set();
  for (let i = 0; i < 80; i++) {
    await page.keyboard.press("Tab");
    const id = await page.evaluate(() => document.activeElement?.id || document.activeElement?.tagName);
    reached.add(id);
    if (id === "run") break;
  }
  for (const id of ["example", "data", "design", "run"]) assert.ok(reached.has(id), `${id} not reached: ${[...reached]}`);
  await page.keyboard.press("Enter");
  await page.waitForSelector("#finding", { timeout: 60000 });
  assert.deepEqual(errors, []);
  await page.close();
});
