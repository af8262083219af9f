// Trunk post-build hook. (1) Pins the page's Content-Security-Policy to the exact inline
// script Trunk wrote (a sha256 hash instead of 'unsafe-inline'). (2) Writes
// reshuffle-offline.html: one self-contained file with the page, the styles, both wasm
// programs (base64) and the worker (started from a Blob URL), which works when opened from
// disk (file://) with no server and no network.
import fs from "node:fs";
import path from "node:path";
import crypto from "node:crypto";

const dir = process.env.TRUNK_STAGING_DIR || process.argv[2] || "dist";
const read = (f) => fs.readFileSync(path.join(dir, f));
const files = fs.readdirSync(dir);
const find = (re) => {
  const f = files.find((x) => re.test(x));
  if (!f) throw new Error(`bundle-offline: no file matching ${re} in ${dir}`);
  return f;
};
const sha = (text) => `'sha256-${crypto.createHash("sha256").update(text, "utf8").digest("base64")}'`;

let index = read("index.html").toString();
const inline = /<script type="module">([\s\S]*?)<\/script>/.exec(index);
if (!inline) throw new Error("bundle-offline: Trunk's inline module script was not found");

// (1) The served page: scripts from this site plus the one inline loader; the worker and
// wasm come from this site; no other connection is allowed.
const servedCsp = [
  "default-src 'self'",
  `script-src 'self' 'wasm-unsafe-eval' ${sha(inline[1])}`,
  "worker-src 'self'",
  "connect-src 'self'",
  "img-src 'self' data: blob:",
  "style-src 'self' 'unsafe-inline'",
  "object-src 'none'",
  "base-uri 'none'",
  "form-action 'none'",
].join("; ");
if (!index.includes("RESHUFFLE_CSP")) throw new Error("bundle-offline: CSP placeholder missing in index.html");
fs.writeFileSync(path.join(dir, "index.html"), index.replace("RESHUFFLE_CSP", servedCsp));

// (2) The single file.
const appJs = read(find(/^app-.*\.js$/)).toString();
const appWasm = read(find(/^app-.*_bg\.wasm$/)).toString("base64");
const workerJs = read("worker.js").toString();
const workerWasm = read("worker_bg.wasm").toString("base64");
const css = read(find(/^main-.*\.css$/)).toString();

const decode = "const __bytes = (b) => Uint8Array.from(atob(b), (c) => c.charCodeAt(0));";
const workerSource =
  `${workerJs}\n${decode}\nwasm_bindgen({ module_or_path: __bytes(${JSON.stringify(workerWasm)}) });\n`;
const script = `
${appJs}
${decode}
{
  const workerBlob = new Blob([${JSON.stringify(workerSource)}], { type: "text/javascript" });
  window.RESHUFFLE_WORKER_URL = URL.createObjectURL(workerBlob);
  window.RESHUFFLE_OFFLINE = true;
}
await __wbg_init({ module_or_path: __bytes(${JSON.stringify(appWasm)}) });
`;
const offlineCsp = [
  "default-src 'none'",
  `script-src 'wasm-unsafe-eval' ${sha(script)}`,
  "worker-src blob:",
  "img-src data: blob:",
  "style-src 'unsafe-inline'",
  "base-uri 'none'",
  "form-action 'none'",
].join("; ");
let single = index
  .replace(inline[0], () => `<script type="module">${script}</script>`)
  .replace("RESHUFFLE_CSP", offlineCsp)
  .replace(/<link rel="stylesheet"[^>]*>/, () => `<style>${css}</style>`)
  .replace(/<link rel="(modulepreload|preload)"[^>]*>/g, "");
if (/(src|href)="(?!data:)[^"#]/i.test(single.replace(/<script type="module">[\s\S]*<\/script>/, ""))) {
  throw new Error("bundle-offline: the single file still refers to another file");
}
fs.writeFileSync(path.join(dir, "reshuffle-offline.html"), single);
console.log(`bundle-offline: wrote ${path.join(dir, "reshuffle-offline.html")} (${(single.length / 1048576).toFixed(1)} MB)`);
