// What the served page downloads (dist/ without the single offline file), gzipped at level 9
// as a static host would send it, and a check against a ceiling. The ceiling is today's size
// plus a margin, so the download cannot grow unnoticed; the goal is 500 KB (the page's module
// without the engine), not reached yet.
import fs from "node:fs";
import path from "node:path";
import zlib from "node:zlib";

const CEILING_KB = 1100;
const dir = process.argv[2] || "dist";
const files = fs.readdirSync(dir).filter((f) => /\.(wasm|js|css|html)$/.test(f) && f !== "reshuffle-offline.html");
let total = 0;
for (const f of files.sort()) {
  const gz = zlib.gzipSync(fs.readFileSync(path.join(dir, f)), { level: 9 }).length;
  total += gz;
  console.log(`  ${f.padEnd(40)} ${(gz / 1024).toFixed(1).padStart(8)} KB gzipped`);
}
console.log(`  ${"total".padEnd(40)} ${(total / 1024).toFixed(1).padStart(8)} KB gzipped (ceiling ${CEILING_KB} KB)`);
if (total / 1024 > CEILING_KB) {
  console.error(`The page's download grew past ${CEILING_KB} KB gzipped; find what grew before raising the ceiling.`);
  process.exit(1);
}
