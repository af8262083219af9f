// Browser end-to-end tests: the built page (dist/) served on 127.0.0.1, driven in Debian's
// headless chromium by playwright-core. Run after `trunk build --release`.
import { test, before, after } from "node:test";
import assert from "node:assert/strict";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { chromium } from "playwright-core";
import { execFileSync } from "node:child_process";
import { serve } from "./server.mjs";

const here = path.dirname(fileURLToPath(import.meta.url));
const root = path.resolve(here, "../..");
const dist = path.join(root, "dist");
const out = path.join(here, "out");
fs.mkdirSync(out, { recursive: true });

function chromiumPath() {
  for (const p of [process.env.CHROMIUM, "/usr/bin/chromium", "/usr/bin/chromium-browser"]) {
    if (p && fs.existsSync(p)) return p;
  }
  throw new Error("Debian's chromium was not found (apt-get install chromium)");
}

let server, base, browser, context;
const requests = [];

before(async () => {
  assert.ok(fs.existsSync(path.join(dist, "index.html")), "dist/index.html missing: run trunk build --release first");
  execFileSync("cargo", ["build", "--quiet", "--bin", "reshuffle"], { cwd: root, stdio: "inherit" });
  server = await serve(dist);
  base = `http://127.0.0.1:${server.address().port}/`;
  const userDataDir = fs.mkdtempSync(path.join(os.tmpdir(), "reshuffle-chromium-"));
  context = await chromium.launchPersistentContext(userDataDir, {
    executablePath: chromiumPath(),
    headless: true,
    args: [
      "--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking",
      "--disable-component-update", "--disable-sync", "--no-first-run", "--disable-quic",
    ],
    viewport: { width: 1280, height: 900 },
  });
  context.on("request", (r) => requests.push(r.url()));
  browser = context;
});

after(async () => {
  await context?.close();
  server?.close();
});

async function openPage() {
  const page = await context.newPage();
  const errors = [];
  page.on("pageerror", (e) => errors.push(String(e)));
  await page.goto(base);
  await page.waitForSelector("#run:not([disabled])", { timeout: 30000 });
  return { page, errors };
}

test("the demo analysis runs in the worker and shows the finding and both plots", async () => {
  const { page, errors } = await openPage();
  // The default example (invented tomato data) is loaded, with a preview.
  await page.waitForSelector("#preview table");
  assert.match(await page.textContent("#preview"), /yield_kg/);
  await page.click("details:has(#seed) > summary");
  await page.fill("#seed", "2024");
  await page.click("#run");
  await page.waitForSelector("#finding", { timeout: 60000 });
  const finding = await page.textContent("#finding");
  assert.match(finding, /The mean yield_kg was 0\.\d+ higher in drip than in sprinkler \(95% CI \[/);
  assert.match(finding, /random relabellings of the groups \(p = \.0\d\d\)/);
  // Both figures are SVG with a title and a text alternative.
  for (const id of ["#figure-relabelling svg", "#figure-bootstrap svg"]) {
    const svg = await page.$(id);
    assert.ok(svg, `${id} missing`);
    assert.equal(await svg.getAttribute("role"), "img");
    assert.ok((await svg.$("title")) && (await svg.$("desc")), `${id} needs title and desc`);
  }
  assert.ok((await page.$$("#figure-relabelling rect")).length > 10, "histogram bars drawn");
  assert.match(await page.textContent("#groups-table"), /drip/);
  assert.match(await page.textContent(".cautions"), /qualified statistician/);
  // The same seed gives the same numbers as the native command (checked in cli tests) and
  // as a second run here.
  await page.click("#run");
  await page.waitForSelector("#finding");
  assert.equal(await page.textContent("#finding"), finding);
  // The address bar is now a working link to this analysis.
  assert.match(await page.evaluate(() => location.hash), /^#r2\./);
  // Figures download as SVG and as PNG.
  const [svgDl] = await Promise.all([page.waitForEvent("download"), page.click("text=Figure: relabelling (SVG)")]);
  assert.match(fs.readFileSync(await svgDl.path(), "utf8"), /^<svg[^>]*role="img"/);
  const [pngDl] = await Promise.all([page.waitForEvent("download"), page.click("text=Figure: bootstrap (PNG)")]);
  const png = fs.readFileSync(await pngDl.path());
  assert.equal(png.subarray(1, 4).toString(), "PNG");
  assert.ok(png.length > 5000, "the PNG has content");
  await page.screenshot({ path: path.join(out, "findings.png"), fullPage: true });
  assert.deepEqual(errors, []);
  await page.close();
});

test("a broken table gets a specific message and the pasted text is kept", async () => {
  const { page } = await openPage();
  const broken = "yield,schedule\n4.1,drip\n3.9,drip\n4.l,drip\n3.0,sprinkler\n2.8,sprinkler\n";
  await page.fill("#data", broken);
  await page.click("#run");
  await page.waitForSelector("#run-error", { timeout: 30000 });
  const msg = await page.textContent("#run-error");
  assert.match(msg, /Line 4 of column "yield" holds "4\.l", which is not a number/);
  assert.equal(await page.inputValue("#data"), broken);
  // A table with one group only.
  await page.fill("#data", "y,g\n1,a\n2,a\n3,a\n");
  await page.click("#run");
  await page.waitForFunction(() => /only one group/.test(document.querySelector("#run-error")?.textContent || ""));
  await page.screenshot({ path: path.join(out, "error.png"), fullPage: true });
  await page.close();
});

test("a long run shows progress and can be stopped", async () => {
  const { page } = await openPage();
  await page.click("details:has(#seed) > summary");
  await page.fill("#resamples", "10000000");
  await page.selectOption("#statistic", "median-difference");
  await page.click("#run");
  await page.waitForSelector("#progress", { timeout: 30000 });
  // The p-value so far, with its interval, while the run goes.
  await page.waitForFunction(() => /so far p ≈ [\d.e-]+ \(b = [\d,]+ of [\d,]+; 99% interval/.test(document.querySelector("#running-p")?.textContent || ""), null, { timeout: 30000 });
  // The relabelled statistics fill in a figure while the run goes: its bars grow.
  const drawn = async () => Number(((await page.textContent("#live-figure figcaption")) || "").match(/of the ([\d,]+) relabellings/)[1].replace(/,/g, ""));
  await page.waitForSelector("#live-figure svg[role=img] desc", { state: "attached", timeout: 30000 });
  const before = await drawn();
  await page.waitForFunction((n) => {
    const m = (document.querySelector("#live-figure figcaption")?.textContent || "").match(/of the ([\d,]+) relabellings/);
    return m && Number(m[1].replace(/,/g, "")) > n;
  }, before, { timeout: 30000 });
  assert.ok((await page.$$("#live-figure svg rect")).length > 5, "bars drawn");
  await page.screenshot({ path: path.join(out, "live-figure.png") });
  await page.click("#stop");
  await page.waitForFunction(() => /Stopped/.test(document.querySelector("#status")?.textContent || ""));
  // The page still works after stopping: a small run completes.
  await page.fill("#resamples", "2000");
  await page.click("#run");
  await page.waitForSelector("#finding", { timeout: 60000 });
  await page.close();
});


test("the page and the native command give bit-identical numbers for the same seed", async () => {
  const json = nativeRun([
    "analyze", "demo-data/service-desk-minutes.tsv", "--columns", "north_desk,harbour_desk",
    "--first", "harbour_desk", "--statistic", "median-difference", "--seed", "31337"]);
  const { page } = await openPage();
  await page.selectOption("#example", "desks");
  await page.waitForFunction(() => /north_desk/.test(document.querySelector("#preview")?.textContent || ""));
  await page.selectOption("#first", "harbour_desk");
  await page.selectOption("#statistic", "median-difference");
  await page.click("details:has(#seed) > summary");
  await page.fill("#seed", "31337");
  await page.click("#run");
  await page.waitForSelector("#finding", { timeout: 60000 });
  // Rust's {:?} prints the shortest text that round-trips, as JSON does, so the page's
  // full-precision attributes parse back to the very same doubles.
  assert.equal(await num(page, "data-estimate"), json.effect);
  assert.equal(await num(page, "data-p-value"), json.p_value);
  assert.equal(await num(page, "data-ci-low"), json.ci.low);
  assert.equal(await num(page, "data-ci-high"), json.ci.high);
  // The page's report data file holds the same report as the command's --json, number for number.
  const [dl] = await Promise.all([page.waitForEvent("download"), page.click("#download-json")]);
  const fromPage = JSON.parse(fs.readFileSync(await dl.path(), "utf8"));
  assert.equal(fromPage.format_version, 2);
  // The page also keeps every resampled value (for its values download); the command keeps
  // them only when asked. Everything else is the same.
  const { null_values, bootstrap_values, ...rest } = fromPage.report;
  assert.equal(bootstrap_values.length, json.bootstrap_resamples);
  assert.equal(null_values.length, json.resamples);
  assert.deepEqual(rest, json.envelope.report);
  assert.equal(await page.textContent("#finding"), json.finding);
  await page.close();
});

test("markup in the data is shown as text, never run", async () => {
  const { page } = await openPage();
  let dialogs = 0;
  page.on("dialog", async (d) => { dialogs += 1; await d.dismiss(); });
  const hostile = 'y,g\n1,<img src=x onerror=alert(1)>\n2,<img src=x onerror=alert(1)>\n3,<img src=x onerror=alert(1)>\n' +
    '4,"<svg onload=alert(2)>"\n5,"<svg onload=alert(2)>"\n6,"<svg onload=alert(2)>"\n';
  await page.fill("#data", hostile);
  await page.click("details:has(#seed) > summary");
  await page.fill("#resamples", "999");
  await page.fill("#bootstrap", "999");
  await page.click("#run");
  await page.waitForSelector("#finding", { timeout: 60000 });
  assert.match(await page.textContent("#finding"), /<img src=x onerror=alert\(1\)>/);
  assert.equal(await page.$$eval("#findings img", (els) => els.length), 0);
  assert.equal(dialogs, 0);
  await page.close();
});

test("estimate only: every interval method, and the same numbers as the native command", async () => {
  const json = nativeRun([
    "estimate", "demo-data/tomato-irrigation.csv", "--value", "yield_kg", "--estimate", "median",
    "--interval", "all", "--seed", "777"]);
  const { page, errors } = await openPage();
  await page.check("#mode-estimate");
  await page.selectOption("#est-kind", "median");
  await page.click("details:has(#seed) > summary");
  await page.fill("#seed", "777");
  await page.click("#run");
  await page.waitForSelector("#finding", { timeout: 60000 });
  assert.match(await page.textContent("#finding"), /^The median of yield_kg is /);
  const rows = await page.$$eval("#interval-table tbody tr", (trs) => trs.map((t) => t.textContent));
  assert.equal(rows.length, 5);
  for (const name of ["BCa", "percentile", "basic", "normal", "studentized"]) {
    assert.ok(rows.some((r) => r.includes(name)), `${name} row`);
  }
  const some = (v) => (v === null ? "None" : `Some(${Number.isInteger(v) ? `${v}.0` : String(v)})`);
  assert.equal(await num(page, "data-ci-low"), json.intervals[0].low);
  assert.equal(await num(page, "data-ci-high"), json.intervals[0].high);
  assert.equal(await page.textContent("#finding"), json.finding);
  assert.ok(await page.$("#figure-bootstrap svg title"));
  await page.screenshot({ path: path.join(out, "estimate.png"), fullPage: true });
  assert.deepEqual(errors, []);
  await page.close();
});

function native(args) {
  return execFileSync(path.join(root, "target/debug/reshuffle"), args, { cwd: root, encoding: "utf8", maxBuffer: 256 * 1024 * 1024 });
}

// The native command's report for `args`: the fields of its --json report (format version 2:
// {format_version, engine_version, design, report}), the whole envelope, and the finding, the
// first line of its plain-text output.
function nativeRun(args) {
  const envelope = JSON.parse(native([...args, "--json"]));
  assert.equal(envelope.format_version, 2);
  const finding = native(args).split("\n")[0];
  return { ...envelope.report, envelope, finding };
}

// A full-precision number the page writes on #findings (empty when there is none).
async function num(page, name) {
  const v = await page.getAttribute("#findings", name);
  return v === "" || v === null ? null : Number(v);
}

test("a share link restores the page and reproduces the sender's numbers", async () => {
  const opts = ["demo-data/service-desk-minutes.tsv", "--columns", "north_desk,harbour_desk", "--statistic", "welch-t",
    "--alternative", "less", "--seed", "8080", "--resamples", "20000", "--bootstrap", "4000"];
  const link = native(["link", ...opts, "--base", base]).trim();
  const json = nativeRun(["analyze", ...opts]);
  const page = await context.newPage();
  await page.goto(link);
  await page.waitForSelector("#finding", { timeout: 60000 });
  assert.equal(await page.textContent("#finding"), json.finding);
  assert.equal(await num(page, "data-p-value"), json.p_value);
  // The settings were restored, and the address bar stays a working link.
  assert.equal(await page.inputValue("#seed"), "8080");
  assert.match(await page.evaluate(() => location.hash), /^#r2\./);
  // The page's own link for the same analysis gives the same numbers in a fresh tab.
  await page.click("#copy-link");
  const own = await page.inputValue("#share-link");
  assert.ok(own.startsWith(base + "#r2."), own);
  const again = await context.newPage();
  await again.goto(own);
  await again.waitForSelector("#finding", { timeout: 60000 });
  assert.equal(await again.textContent("#finding"), json.finding);
  await again.close();
  await page.close();
});

test("share links of format version 1 keep opening with the same numbers", async () => {
  // Pinned links made by the version-1 page (tests/fixtures/v1/links) and the reports they gave.
  for (const name of ["two-groups-desks-welch-less", "k-groups-adhesive", "yes-no-seeds", "paired-sleep-exact"]) {
    const link = fs.readFileSync(path.join(root, "tests/fixtures/v1/links", name + ".txt"), "utf8").trim();
    const pinned = JSON.parse(fs.readFileSync(path.join(root, "tests/fixtures/v1/reports", name + ".json"), "utf8"));
    const page = await context.newPage();
    await page.goto(base + link.slice(link.indexOf("#")));
    await page.waitForSelector("#finding", { timeout: 90000 });
    assert.equal(await num(page, "data-p-value"), pinned.p_value, name);
    assert.equal(await num(page, "data-ci-low"), pinned.ci.low, name);
    assert.match(await page.textContent("#link-error"), /carries no integrity check/, name);
    await page.close();
  }
});

test("damaged or hostile links give a message and a working page; nothing from a link runs", async () => {
  const page = await context.newPage();
  let dialogs = 0;
  page.on("dialog", async (d) => { dialogs += 1; await d.dismiss(); });
  await page.goto(base + "#r1.this-is-not-a-real-code");
  await page.waitForSelector("#run:not([disabled])");
  assert.match(await page.textContent("#link-error"), /damaged/);
  // A version-2 link with one character of its payload changed fails its integrity check.
  const good = native(["link", "demo-data/tomato-irrigation.csv", "--seed", "3", "--base", base]).trim();
  const at = good.indexOf("#r2.") + 10;
  const flipped = good.slice(0, at) + (good[at] === "A" ? "B" : "A") + good.slice(at + 1);
  await page.goto(flipped);
  await page.reload();
  await page.waitForFunction(() => /changed or cut/.test(document.querySelector("#link-error")?.textContent || ""));
  // The message belongs to the link: it goes once the user pastes other data.
  await page.fill("#data", "y,g\n1,a\n2,a\n3,b\n4,b\n");
  await page.waitForFunction(() => (document.querySelector("#link-error")?.textContent || "") === "");
  await page.goto(base + "#r9.abc");
  await page.reload();
  await page.waitForFunction(() => /newer version/.test(document.querySelector("#link-error")?.textContent || ""));
  // The page still works with the example.
  await page.click("#run");
  await page.waitForSelector("#finding", { timeout: 60000 });
  // A well-formed link whose data hold markup.
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "reshuffle-e2e-"));
  const f = path.join(dir, "hostile.csv");
  fs.writeFileSync(f, 'y,g\n1,"<img src=x onerror=alert(1)>"\n2,"<img src=x onerror=alert(1)>"\n3,"<img src=x onerror=alert(1)>"\n' +
    '4,<svg/onload=alert(2)>\n5,<svg/onload=alert(2)>\n6,<svg/onload=alert(2)>\n');
  const link = native(["link", f, "--seed", "1", "--resamples", "999", "--bootstrap", "500", "--base", base]).trim();
  await page.goto(link);
  await page.reload();
  await page.waitForSelector("#finding", { timeout: 60000 });
  assert.match(await page.textContent("#finding"), /<img src=x onerror=alert\(1\)>/);
  assert.equal(await page.$$eval("main img", (els) => els.length), 0);
  assert.equal(dialogs, 0);
  await page.close();
});

test("a link too long for chat programs gets a warning with two ways out", async () => {
  const { page } = await openPage();
  let rows = "value,group\n";
  for (let i = 0; i < 3000; i++) rows += `${(Math.abs(Math.sin(i * 12.9898)) * 1000).toFixed(4)},${i % 2 ? "a" : "b"}\n`;
  // Set the text directly: typing 3,000 rows through the automation layer is slow.
  await page.evaluate((text) => {
    const ta = document.querySelector("#data");
    ta.value = text;
    ta.dispatchEvent(new Event("input", { bubbles: true }));
  }, rows);
  await page.click("details:has(#seed) > summary");
  await page.fill("#resamples", "999");
  await page.fill("#bootstrap", "500");
  await page.click("#run");
  await page.waitForSelector("#finding", { timeout: 60000 });
  await page.click("#copy-link");
  const note = await page.textContent("#share-note");
  assert.match(note, /characters long/);
  assert.match(note, /settings-only link/);
  assert.match(note, /save the analysis as a file/);
  await page.click("#copy-settings-link");
  const short = await page.inputValue("#share-link");
  assert.ok(short.length < 2000, `settings-only link is ${short.length} characters`);
  await page.close();
});

test("reports and analysis files: download, save and reopen", async () => {
  const { page } = await openPage();
  await page.click("details:has(#seed) > summary");
  await page.fill("#seed", "99");
  await page.click("#run");
  await page.waitForSelector("#finding", { timeout: 60000 });
  const finding = await page.textContent("#finding");
  const grab = async (id) => {
    const [dl] = await Promise.all([page.waitForEvent("download"), page.click(id)]);
    return fs.readFileSync(await dl.path(), "utf8");
  };
  const html = await grab("#download-report");
  assert.match(html, /<svg/);
  assert.ok(!/<script/i.test(html), "the report runs no script");
  assert.ok(html.includes("seed 99"));
  const csv = await grab("#download-values");
  assert.match(csv.split("\n")[0], /^index,relabelled,bootstrap$/);
  assert.equal(csv.trim().split("\n").length, 100001);
  const saved = await grab("#save-analysis");
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "reshuffle-e2e-"));
  const file = path.join(dir, "analysis.json");
  fs.writeFileSync(file, saved);
  // Reopen in a fresh page and run: the same finding.
  const { page: p2 } = await openPage();
  await p2.setInputFiles("#open-analysis", file);
  await p2.waitForFunction(() => /Opened the analysis/.test(document.body.textContent));
  await p2.click("#run");
  await p2.waitForSelector("#finding", { timeout: 60000 });
  assert.equal(await p2.textContent("#finding"), finding);
  // The saved file is what the native command reads with --request.
  const json = nativeRun(["analyze", "--request", file]);
  assert.equal(json.finding, finding);
  await p2.close();
  await page.close();
});

test("the single-file build works from disk with no server and no network", async () => {
  const file = path.join(dist, "reshuffle-offline.html");
  assert.ok(fs.existsSync(file), "dist/reshuffle-offline.html missing");
  const page = await context.newPage();
  const seen = [];
  page.on("request", (r) => seen.push(r.url()));
  const errors = [];
  page.on("pageerror", (e) => errors.push(String(e)));
  await page.goto("file://" + file);
  await page.waitForSelector("#run:not([disabled])", { timeout: 30000 });
  await page.click("details:has(#seed) > summary");
  await page.fill("#seed", "2024");
  await page.click("#run");
  await page.waitForSelector("#finding", { timeout: 60000 });
  const { page: served } = await openPage();
  await served.click("details:has(#seed) > summary");
  await served.fill("#seed", "2024");
  await served.click("#run");
  await served.waitForSelector("#finding", { timeout: 60000 });
  assert.equal(await page.textContent("#finding"), await served.textContent("#finding"));
  const foreign = seen.filter((u) => !u.startsWith("file:") && !u.startsWith("data:") && !u.startsWith("blob:"));
  assert.deepEqual(foreign, []);
  assert.deepEqual(errors, []);
  await page.screenshot({ path: path.join(out, "offline.png") });
  await served.close();
  await page.close();
});

test("paired and one-sample designs in the page match the native command", async () => {
  const csv = fs.readFileSync(path.join(root, "tests/reference/data/sleep-paired.csv"), "utf8");
  const json = nativeRun(["analyze", "tests/reference/data/sleep-paired.csv", "--design", "paired",
    "--columns", "drug2,drug1", "--seed", "55"]);
  const { page, errors } = await openPage();
  await page.fill("#data", csv);
  await page.check("input[name=layout][value=wide]");
  await page.selectOption("#col-a", "drug2");
  await page.selectOption("#col-b", "drug1");
  await page.selectOption("#design", "paired");
  await page.selectOption("#first", "drug2");
  await page.click("details:has(#seed) > summary");
  await page.fill("#seed", "55");
  await page.click("#run");
  await page.waitForSelector("#finding", { timeout: 60000 });
  assert.equal(await page.textContent("#finding"), json.finding);
  assert.equal(await num(page, "data-p-value"), json.p_value);
  assert.match(await page.textContent("#findings"), /Wilcoxon/);
  assert.ok(await page.$("#figure-sign-flips svg title"));
  // One sample against a reference value.
  const one = nativeRun(["analyze", "tests/reference/data/sleep-paired.csv", "--design", "one-sample",
    "--value", "drug1", "--reference", "0.5", "--statistic", "median", "--seed", "55"]);
  await page.selectOption("#design", "one-sample");
  await page.selectOption("#one-value", "drug1");
  await page.fill("#reference", "0.5");
  await page.selectOption("#flip-stat", "median");
  await page.click("#run");
  await page.waitForFunction((f) => document.querySelector("#finding")?.textContent === f, one.finding, { timeout: 60000 });
  await page.screenshot({ path: path.join(out, "paired.png"), fullPage: true });
  // The signed-rank statistic of the one sample: the command's finding and rank-biserial
  // correlation (tests/signed_rank_checks.rs checks them against scipy).
  const ranked = nativeRun(["analyze", "tests/reference/data/sleep-paired.csv", "--design", "one-sample",
    "--value", "drug1", "--reference", "0.5", "--statistic", "signed-rank", "--seed", "55"]);
  await page.selectOption("#flip-stat", "signed-rank");
  await page.click("#run");
  await page.waitForFunction((f) => document.querySelector("#finding")?.textContent === f, ranked.finding, { timeout: 60000 });
  assert.match(ranked.finding, /rank-biserial correlation/);
  assert.equal(await num(page, "data-estimate"), ranked.rank_biserial);
  assert.deepEqual(errors, []);
  await page.close();
});

test("association in the page matches the native command and draws a scatter plot", async () => {
  const csv = fs.readFileSync(path.join(root, "tests/reference/data/cars.csv"), "utf8");
  const json = nativeRun(["analyze", "tests/reference/data/cars.csv", "--design", "association",
    "--x", "speed", "--y", "dist", "--statistic", "spearman", "--seed", "66"]);
  const { page, errors } = await openPage();
  await page.fill("#data", csv);
  await page.selectOption("#design", "association");
  await page.selectOption("#assoc-x", "speed");
  await page.selectOption("#assoc-y", "dist");
  await page.selectOption("#assoc-stat", "spearman");
  await page.click("details:has(#seed) > summary");
  await page.fill("#seed", "66");
  await page.click("#run");
  await page.waitForSelector("#finding", { timeout: 60000 });
  assert.equal(await page.textContent("#finding"), json.finding);
  assert.equal(await num(page, "data-ci-low"), json.ci.low);
  assert.equal((await page.$$("#figure-scatter circle")).length, 50);
  assert.match(await page.textContent(".cautions"), /not causation/);
  await page.screenshot({ path: path.join(out, "association.png"), fullPage: true });
  // Kendall's tau-b: the command's numbers (tests/kendall_checks.rs checks them against scipy).
  const tau = nativeRun(["analyze", "tests/reference/data/cars.csv", "--design", "association",
    "--x", "speed", "--y", "dist", "--statistic", "kendall", "--seed", "66"]);
  await page.selectOption("#assoc-stat", "kendall");
  await page.click("#run");
  await page.waitForFunction((f) => document.querySelector("#finding")?.textContent === f, tau.finding, { timeout: 60000 });
  assert.match(tau.finding, /Kendall tau-b/);
  assert.equal(await num(page, "data-p-value"), tau.p_value);
  assert.match(await page.textContent("#findings"), /Kendall's normal approximation/);
  assert.deepEqual(errors, []);
  await page.close();
});

test("the page works by keyboard alone and on a narrow screen", async () => {
  const page = await context.newPage();
  await page.setViewportSize({ width: 390, height: 844 });
  await page.goto(base);
  await page.waitForSelector("#run:not([disabled])");
  await page.focus("#data");
  let reached = false;
  for (let i = 0; i < 80 && !reached; i++) {
    await page.keyboard.press("Tab");
    reached = await page.evaluate(() => document.activeElement?.id === "run");
  }
  assert.ok(reached, "Tab reaches the Run button");
  await page.keyboard.press("Enter");
  await page.waitForSelector("#finding", { timeout: 60000 });
  // Nothing is wider than the screen except scrollable regions.
  const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
  assert.ok(overflow <= 1, `page overflows by ${overflow}px`);
  await page.screenshot({ path: path.join(out, "narrow.png"), fullPage: true });
  await page.close();
});

test("the page makes no request beyond its own files", async () => {
  // (file: is the single-file build opened from disk in its own test.)
  const foreign = requests.filter((u) => !u.startsWith(base) && !/^(data|blob|file):/.test(u));
  assert.deepEqual(foreign, []);
});

async function runWithSeed(page, seed) {
  if (!(await page.isVisible("#seed"))) await page.click("details:has(#seed) > summary");
  await page.fill("#seed", String(seed));
  await page.click("#run");
}

test("k groups: suggested from the table, same numbers as the native command, adjusted comparisons", async () => {
  const json = nativeRun(["analyze", "demo-data/adhesive-shear-strength.csv", "--design", "k-groups", "--seed", "21"]);
  const { page, errors } = await openPage();
  await page.selectOption("#example", "adhesives");
  await page.waitForFunction(() => document.querySelector("#design").value === "k-groups");
  assert.match(await page.textContent("#suggestion"), /names 4 groups/);
  await runWithSeed(page, 21);
  await page.waitForSelector("#findings", { timeout: 90000 });
  assert.equal(await page.textContent("#finding"), json.finding);
  assert.equal(await num(page, "data-p-value"), json.p_value);
  assert.equal(await num(page, "data-ci-low"), json.ci.low);
  const rows = await page.$$eval("#pairwise-table tbody tr", (trs) => trs.map((t) => t.textContent));
  assert.equal(rows.length, 6);
  assert.match(await page.textContent("#pairwise-table thead"), /Holm p.*BH p/);
  assert.match(await page.textContent(".cautions"), /family-wise error.*false discovery rate/s);
  for (const id of ["#figure-groups", "#figure-relabelling", "#figure-bootstrap"]) {
    assert.ok(await page.$(`${id} svg title`), `${id} has a title`);
  }
  await page.screenshot({ path: path.join(out, "k-groups.png"), fullPage: true });
  // On a phone-width screen the wide comparison table scrolls inside its own region.
  await page.setViewportSize({ width: 390, height: 844 });
  const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
  assert.ok(overflow <= 1, `page overflows by ${overflow}px`);
  await page.screenshot({ path: path.join(out, "k-groups-narrow.png"), fullPage: true });
  assert.deepEqual(errors, []);
  await page.close();
});

test("stratified: the reversal the strata hide, and the native command's numbers", async () => {
  const json = nativeRun(["analyze", "demo-data/coating-wear-by-line.csv", "--design", "stratified",
    "--value", "wear_um", "--group", "coating", "--strata", "line", "--seed", "22"]);
  const { page, errors } = await openPage();
  await page.selectOption("#example", "coatings");
  await page.waitForFunction(() => document.querySelector("#design").value === "stratified");
  assert.equal(await page.inputValue("#strata-col"), "line");
  await runWithSeed(page, 22);
  await page.waitForSelector("#findings", { timeout: 90000 });
  assert.equal(await page.textContent("#finding"), json.finding);
  assert.match(json.finding, /With the strata ignored, the difference would be 3\.\d/);
  assert.equal(await num(page, "data-p-value"), json.p_value);
  assert.equal((await page.$$("#strata-table tbody tr")).length, 4);
  assert.match(await page.textContent(".cautions"), /Simpson's paradox/);
  await page.screenshot({ path: path.join(out, "stratified.png"), fullPage: true });
  assert.deepEqual(errors, []);
  await page.close();
});

test("yes/no outcomes from a column and from typed counts; bad counts get a message", async () => {
  const json = nativeRun(["analyze", "demo-data/seed-germination.csv", "--design", "yes-no",
    "--value", "germinated", "--group", "storage", "--seed", "23"]);
  const { page, errors } = await openPage();
  await page.selectOption("#example", "seeds");
  await page.waitForFunction(() => document.querySelector("#design").value === "yes-no");
  await runWithSeed(page, 23);
  await page.waitForSelector("#findings", { timeout: 90000 });
  assert.equal(await page.textContent("#finding"), json.finding);
  assert.equal(await num(page, "data-ci-high"), json.ci.high);
  assert.match(await page.textContent("#findings"), /Fisher's exact test/);
  assert.ok((await page.$$("#figure-tables rect")).length > 10, "the exact distribution is drawn");
  // Counts typed in, with a risk ratio.
  const counts = nativeRun(["analyze", "--design", "yes-no", "--counts", "old: 42/300, new: 61/310",
    "--statistic", "risk-ratio", "--seed", "23"]);
  await page.check("#yn-counts-choice");
  await page.fill("#counts", "old: 42/300, new: 61/310");
  await page.selectOption("#yn-stat", "risk-ratio");
  await page.click("#run");
  await page.waitForFunction((f) => document.querySelector("#finding")?.textContent === f, counts.finding, { timeout: 60000 });
  // Markup in typed group names is shown as text, never run.
  let dialogs = 0;
  page.on("dialog", async (d) => { dialogs += 1; await d.dismiss(); });
  await page.fill("#counts", "<img src=x onerror=alert(1)>: 3/20, <svg onload=alert(2)>: 9/21");
  await page.click("#run");
  await page.waitForFunction(() => /<img src=x onerror=alert\(1\)>/.test(document.querySelector("#finding")?.textContent || ""), null, { timeout: 60000 });
  assert.equal(await page.$$eval("#findings img", (els) => els.length), 0);
  assert.equal(dialogs, 0);
  // Counts that cannot be right: a specific message, and what was typed stays.
  await page.fill("#counts", "old: 42/30, new: 61/310");
  assert.match(await page.textContent("#counts-error"), /cannot outnumber the total/);
  await page.click("#run");
  assert.equal(await page.inputValue("#counts"), "old: 42/30, new: 61/310");
  await page.screenshot({ path: path.join(out, "yes-no.png"), fullPage: true });
  assert.deepEqual(errors, []);
  await page.close();
});

test("paired data in long format are recognised by their unit column", async () => {
  const csv = "height,time,plant\n" + [
    [11.2, 12.9], [10.4, 11.1], [12.8, 13.0], [9.9, 11.8], [11.5, 12.2], [10.8, 12.6], [12.1, 12.4], [10.2, 11.9],
  ].map(([a, b], i) => `${a},before,p${i + 1}\n${b},after,p${i + 1}`).join("\n") + "\n";
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "reshuffle-e2e-"));
  const file = path.join(dir, "long.csv");
  fs.writeFileSync(file, csv);
  const json = nativeRun(["analyze", file, "--design", "paired", "--value", "height", "--group", "time",
    "--unit", "plant", "--first", "after", "--second", "before", "--seed", "24"]);
  const { page, errors } = await openPage();
  await page.fill("#data", csv);
  await page.waitForFunction(() => document.querySelector("#design").value === "paired");
  assert.equal(await page.inputValue("#unit-col"), "plant");
  await page.selectOption("#first", "after");
  await page.selectOption("#second", "before");
  await runWithSeed(page, 24);
  await page.waitForSelector("#finding", { timeout: 60000 });
  assert.equal(await page.textContent("#finding"), json.finding);
  assert.deepEqual(errors, []);
  await page.close();
});

test("a link to a k-group analysis reproduces it in a fresh page", async () => {
  const opts = ["demo-data/adhesive-shear-strength.csv", "--design", "k-groups", "--control", "acrylic",
    "--statistic", "median-spread", "--seed", "25", "--resamples", "20000", "--bootstrap", "2000"];
  const link = native(["link", ...opts, "--base", base]).trim();
  const json = nativeRun(["analyze", ...opts]);
  const page = await context.newPage();
  await page.goto(link);
  await page.waitForSelector("#findings", { timeout: 90000 });
  assert.equal(await page.textContent("#finding"), json.finding);
  assert.equal(await page.inputValue("#design"), "k-groups");
  assert.equal(await page.inputValue("#control"), "acrylic");
  assert.equal(await page.inputValue("#k-stat"), "median-spread");
  await page.close();
});

test("planning: sample size and detectable effect by simulation, same numbers as the native command", async () => {
  const json = nativeRun(["plan", "--design", "two-groups", "--sd", "1", "--effect", "0.5", "--mde-n", "30",
    "--seed", "26"]);
  const { page, errors } = await openPage();
  await page.check("#mode-plan");
  await page.fill("#plan-mde-n", "30");
  await runWithSeed(page, 26);
  await page.waitForSelector("#findings", { timeout: 120000 });
  assert.equal(await page.textContent("#finding"), json.finding);
  assert.equal(await num(page, "data-ci-low"), json.smoothed.n);
  assert.match(await page.textContent("#findings"), /What was traded for speed/);
  assert.match(await page.textContent("#findings"), /smallest difference in means .* detectable with 80% power/);
  assert.ok((await page.$$("#figure-power circle")).length >= 5, "power curve points drawn");
  assert.match(await page.textContent(".cautions"), /qualified statistician/);
  // Yes/no rates, and a link that reproduces the plan.
  await page.selectOption("#plan-design", "yes-no");
  await page.fill("#plan-baseline", "0.2");
  await page.fill("#plan-rate", "0.4");
  await page.click("#run");
  await page.waitForFunction(() => /yes\/no outcomes, baseline rate 0\.2/.test(document.querySelector("#findings")?.textContent || ""), null, { timeout: 120000 });
  const finding = await page.textContent("#finding");
  await page.click("#copy-link");
  const link = await page.inputValue("#share-link");
  const again = await context.newPage();
  await again.goto(link);
  await again.waitForSelector("#findings", { timeout: 120000 });
  assert.equal(await again.textContent("#finding"), finding);
  assert.equal(await again.inputValue("#plan-design"), "yes-no");
  await page.screenshot({ path: path.join(out, "plan.png"), fullPage: true });
  assert.deepEqual(errors, []);
  await again.close();
  await page.close();
});

test("a large table stops early by the sequential rules, with the native command's numbers", async () => {
  // 20,000 rows: both rules are filled in, stop after 20 at least as extreme (Besag and
  // Clifford 1991) and settle against 0.05; the page's numbers equal the command's with the
  // same options, for each rule on its own, and cleared by hand the fixed number is drawn.
  let csv = "y,g\n";
  for (let i = 0; i < 20000; i++) {
    const g = i % 2 === 0 ? "a" : "b";
    csv += `${((i * 7919) % 1000) / 10 + (g === "a" ? 0.4 : 0)},${g}\n`;
  }
  const file = path.join(out, "large-two-groups.csv");
  fs.writeFileSync(file, csv);
  const common = ["--seed", "4242", "--bootstrap", "1000"];
  const both = nativeRun(["analyze", file, "--stop-after", "20", "--settle-at", "0.05", ...common]);
  assert.equal(both.sequential.early, true);
  assert.equal(both.sequential.settled, undefined);
  const settled = nativeRun(["analyze", file, "--settle-at", "0.05", ...common]);
  assert.equal(settled.sequential.settled, "above");
  const { page, errors } = await openPage();
  await page.evaluate((text) => {
    const t = document.querySelector("#data");
    t.value = text;
    t.dispatchEvent(new Event("input", { bubbles: true }));
  }, csv);
  await page.waitForFunction(() => /20,000 rows/.test(document.querySelector("#preview")?.textContent || ""), null, { timeout: 30000 });
  await page.click("details:has(#seed) > summary");
  assert.equal(await page.inputValue("#stop-after"), "20");
  assert.equal(await page.inputValue("#settle-at"), "0.05");
  await page.fill("#bootstrap", "1000");
  await runWithSeed(page, 4242);
  await page.waitForSelector("#finding", { timeout: 120000 });
  assert.equal(await num(page, "data-p-value"), both.p_value);
  assert.equal(await page.textContent("#finding"), both.finding);
  assert.match(await page.textContent("#findings"), /sequential Monte Carlo: stopped after/);
  // The count rule cleared: the p-value is settled above 0.05 after whole blocks.
  await page.fill("#stop-after", "");
  await page.click("#run");
  await page.waitForFunction(() => /settled above 0\.05/.test(document.querySelector("#findings")?.textContent || ""), null, { timeout: 120000 });
  assert.equal(await num(page, "data-p-value"), settled.p_value);
  assert.equal(await page.textContent("#finding"), settled.finding);
  // Both cleared by hand: the fixed number is drawn.
  await page.fill("#settle-at", "");
  await page.fill("#resamples", "999");
  await page.click("#run");
  await page.waitForFunction(() => /Monte Carlo, 999 random relabellings/.test(document.querySelector("#findings")?.textContent || ""), null, { timeout: 120000 });
  await page.screenshot({ path: path.join(out, "large-table.png"), fullPage: true });
  assert.deepEqual(errors, []);
  await page.close();
});

test("a 200,000-row paste: read in a worker, first lines at once, a settings-only address, the data kept", async () => {
  const { page, errors } = await openPage();
  let csv = "weight,line\n";
  for (let i = 0; i < 200000; i++) csv += `${(500 + ((i * 7919) % 1000) / 10).toFixed(1)},${i % 2 ? "east" : "west"}\n`;
  const t0 = Date.now();
  await page.evaluate((text) => {
    const t = document.querySelector("#data");
    t.value = text;
    t.dispatchEvent(new Event("input", { bubbles: true }));
  }, csv);
  // The first lines are read here at once; the whole table in a worker.
  await page.waitForFunction(() => /rows/.test(document.querySelector("#preview")?.textContent || ""), null, { timeout: 60000 });
  const first = Date.now() - t0;
  await page.waitForFunction(() => /200,000 rows/.test(document.querySelector("#preview")?.textContent || ""), null, { timeout: 60000 });
  console.log(`# 200,000-row paste: first preview after ${first} ms, whole table after ${Date.now() - t0} ms`);
  assert.match(await page.textContent("#large-data-note"), /not kept in the address bar/);
  // The box shows the first lines, read-only, and says the table is held in the page.
  assert.equal(await page.getAttribute("#data", "data-chars"), String(csv.length));
  assert.ok((await page.inputValue("#data")).length < 70000, "the box shows the first lines only");
  assert.match(await page.textContent("#large-box-note"), /first 200 lines of this table \(200,001 lines/);
  assert.equal(await page.$eval("#data", (t) => t.readOnly), true);
  // The address holds the settings only: short, and it says so when opened.
  const hash = await page.evaluate(() => location.hash);
  assert.ok(hash.length > 0 && hash.length < 5000, `address of ${hash.length} characters`);
  const again = await context.newPage();
  await again.goto(base + hash);
  await again.waitForFunction(() => /settings only/.test(document.body.textContent || ""), null, { timeout: 30000 });
  await again.close();
  // The whole table runs (it is held in the page), and clearing empties the box for editing.
  await runWithSeed(page, 5);
  await page.waitForSelector("#finding", { timeout: 120000 });
  assert.match(await page.textContent("#findings"), /west with n = 100000/);
  await page.click("#clear-data");
  assert.equal(await page.inputValue("#data"), "");
  assert.equal(await page.$eval("#data", (t) => t.readOnly), false);
  assert.deepEqual(errors, []);
  await page.close();
});

test("one run shared among 1, 2 or 3 workers gives the native command's numbers", async () => {
  // 40,000 rows: the streaming kernels for large samples, both sequential rules filled in
  // (the page's default for large tables); ?workers=N shares the run among N workers.
  let csv = "y,g\n";
  for (let i = 0; i < 20000; i++) {
    const v = ((i * 7919) % 1000) / 100;
    csv += `${v},a\n${(v + 0.06).toFixed(2)},b\n`;
  }
  const file = path.join(out, "shared-two-groups.csv");
  fs.writeFileSync(file, csv);
  const json = nativeRun(["analyze", file, "--stop-after", "20", "--settle-at", "0.05", "--seed", "77", "--bootstrap", "2000"]);
  assert.ok(json.notes.some((n) => n.code === "streaming-kernels"), "the streaming kernels ran");
  for (const workers of [1, 2, 3]) {
    const page = await context.newPage();
    const errors = [];
    page.on("pageerror", (e) => errors.push(String(e)));
    await page.goto(`${base}?workers=${workers}`);
    await page.waitForSelector("#run:not([disabled])", { timeout: 30000 });
    await page.evaluate((text) => {
      const t = document.querySelector("#data");
      t.value = text;
      t.dispatchEvent(new Event("input", { bubbles: true }));
    }, csv);
    await page.waitForFunction(() => /40,000 rows/.test(document.querySelector("#preview")?.textContent || ""), null, { timeout: 60000 });
    await page.click("details:has(#seed) > summary");
    await page.fill("#bootstrap", "2000");
    await runWithSeed(page, 77);
    await page.waitForSelector("#finding", { timeout: 120000 });
    assert.equal(await num(page, "data-p-value"), json.p_value, `${workers} workers`);
    assert.equal(await num(page, "data-ci-low"), json.ci.low, `${workers} workers`);
    assert.equal(await page.textContent("#finding"), json.finding, `${workers} workers`);
    const methods = await page.textContent("#findings");
    assert.match(methods, new RegExp(`It ran in ${workers} web worker${workers > 1 ? "s" : ""} of the browser tab`));
    assert.deepEqual(errors, []);
    await page.close();
  }
});

test("the rank-sum statistic in the page: the native command's numbers, with the probability of superiority", async () => {
  const json = nativeRun(["analyze", "demo-data/tomato-irrigation.csv", "--statistic", "rank-sum", "--seed", "808"]);
  const { page, errors } = await openPage();
  await page.waitForSelector("#preview table");
  await page.selectOption("#statistic", "rank-sum");
  await runWithSeed(page, 808);
  await page.waitForSelector("#finding", { timeout: 60000 });
  assert.equal(await page.textContent("#finding"), json.finding);
  assert.match(json.finding, /probability of superiority 0\.\d+/);
  assert.equal(await num(page, "data-p-value"), json.p_value);
  assert.equal(await num(page, "data-ci-low"), json.ci.low);
  const text = await page.textContent("#findings");
  assert.match(text, /Cliff's delta/);
  // U as the command reports it; tests/rank_checks.rs checks it against scipy's mannwhitneyu.
  assert.ok(text.includes(`rank-sum test (cross-check)U = ${json.rank_sum.u}`));
  assert.match(text, /reacts to the unequal spread as well as to a shift/);
  // The Kolmogorov–Smirnov distance (tests/ks_checks.rs checks it against scipy).
  const ks = nativeRun(["analyze", "demo-data/tomato-irrigation.csv", "--statistic", "ks-distance", "--seed", "808"]);
  await page.selectOption("#statistic", "ks-distance");
  await page.click("#run");
  await page.waitForFunction((f) => document.querySelector("#finding")?.textContent === f, ks.finding, { timeout: 60000 });
  assert.match(ks.finding, /Kolmogorov–Smirnov distance/);
  assert.equal(await num(page, "data-p-value"), ks.p_value);
  // The log ratio of the SDs (tests/spread_checks.rs checks it against scipy).
  const sd = nativeRun(["analyze", "demo-data/tomato-irrigation.csv", "--statistic", "log-sd-ratio", "--seed", "808"]);
  await page.selectOption("#statistic", "log-sd-ratio");
  await page.click("#run");
  await page.waitForFunction((f) => document.querySelector("#finding")?.textContent === f, sd.finding, { timeout: 60000 });
  assert.match(sd.finding, /times that in sprinkler/);
  assert.equal(await num(page, "data-ci-high"), sd.ci.high);
  // The MAD ratio: its kept relabellings may be infinite, and the page must still read the
  // worker's report (it once could not).
  const mad = nativeRun(["analyze", "demo-data/tomato-irrigation.csv", "--statistic", "log-mad-ratio", "--seed", "808"]);
  await page.selectOption("#statistic", "log-mad-ratio");
  await page.click("#run");
  await page.waitForFunction((f) => document.querySelector("#finding")?.textContent === f, mad.finding, { timeout: 60000 });
  assert.equal(await num(page, "data-p-value"), mad.p_value);
  assert.deepEqual(errors, []);
  await page.close();
});

test("the robustness table in the page equals the command's, with its one-sentence verdict", async () => {
  const json = nativeRun(["analyze", "demo-data/tomato-irrigation.csv", "--robustness", "--seed", "909"]);
  const text = native(["analyze", "demo-data/tomato-irrigation.csv", "--robustness", "--seed", "909", "--markdown"]);
  const { page, errors } = await openPage();
  await page.waitForSelector("#preview table");
  await page.check("#robustness");
  await runWithSeed(page, 909);
  await page.waitForSelector("#robustness-table", { timeout: 60000 });
  assert.equal(await num(page, "data-p-value"), json.p_value);
  const rows = await page.$$eval("#robustness-table tbody tr", (trs) => trs.map((tr) => tr.cells[0].textContent + "|" + tr.cells[2].textContent));
  // The chosen statistic, the four others, two interval methods and Welch's test.
  assert.equal(rows.length, 8);
  assert.equal(json.robustness.statistics.length, 4);
  for (const o of json.robustness.statistics) {
    assert.ok(rows.some((r) => r.includes(`|p = ${o.p_value.toFixed(3).replace(/^0/, "")}`)), JSON.stringify(o));
  }
  const verdict = await page.textContent("#findings");
  const sentence = json.robustness.verdict.statistics_differ.length === 0 && !json.robustness.verdict.welch_differs
    ? /conclusion is the same under all 5 statistics/ : /depends on the choice/;
  assert.match(verdict, sentence);
  assert.match(text, sentence);
  assert.deepEqual(errors, []);
  await page.close();
});

test("hints from the data: skew, far-out values and a look of pairing, worded as the command words them", async () => {
  const data = "before,after\n12.1,13.0\n15.3,16.2\n11.0,11.9\n19.8,21.0\n14.2,14.8\n13.3,14.1\n16.0,17.2\n12.9,13.5\n55.0,58.0\n14.8,15.9\n";
  const file = path.join(out, "hint-pairs.csv");
  fs.writeFileSync(file, data);
  const text = native(["analyze", file, "--design", "two-groups", "--seed", "5"]);
  const { page, errors } = await openPage();
  await page.evaluate((t) => {
    const ta = document.querySelector("#data");
    ta.value = t;
    ta.dispatchEvent(new Event("input", { bubbles: true }));
  }, data);
  await page.waitForFunction(() => /^10 rows, 2 columns/.test(document.querySelector("#preview .meta")?.textContent || ""));
  await page.selectOption("#design", "two-groups");
  await runWithSeed(page, 5);
  await page.waitForSelector("#finding", { timeout: 60000 });
  const section = await page.$eval(".doc-section:has(h3:text-matches('What the data suggest'))", (s) => [...s.querySelectorAll("li")].map((li) => li.textContent));
  assert.equal(section.length, 5);
  for (const item of section) assert.ok(text.includes(item), item);
  assert.match(section.join(" "), /rise and fall together row by row/);
  assert.deepEqual(errors, []);
  await page.close();
});

test("a run continues with as many relabellings again: the command's numbers for the total", async () => {
  const json = nativeRun(["analyze", "demo-data/tomato-irrigation.csv", "--seed", "4242", "--resamples", "40000"]);
  const { page, errors } = await openPage();
  await page.waitForSelector("#preview table");
  await page.click("details:has(#seed) > summary");
  await page.fill("#resamples", "20000");
  await runWithSeed(page, 4242);
  await page.waitForSelector("#continue-run", { timeout: 60000 });
  assert.match(await page.textContent("#continue-run"), /Add 20,000 more relabellings/);
  await page.click("#continue-run");
  await page.waitForFunction(() => /40,000 random relabellings/.test(document.querySelector("#finding")?.textContent || ""), null, { timeout: 60000 });
  assert.equal(await num(page, "data-p-value"), json.p_value);
  assert.equal(await page.textContent("#finding"), json.finding);
  assert.equal(await page.inputValue("#resamples"), "40000");
  assert.deepEqual(errors, []);
  await page.close();
});
