#!/usr/bin/env node
/**
 * JavaScript the operator's route downloads, gzipped: the entry chunk, the lazy chunk of a route and every
 * chunk they import statically, read from Vite's build manifest (dist/.vite/manifest.json, `build.manifest`).
 *
 *   node scripts/bundle-size.mjs [--route src/app/routes/station.tsx] [--max-kb 300] [--json]
 *
 * Sizes: gzip at level 9 (zlib), kB = 1000 bytes, as Vite's own build report. Exits 1 when the total is
 * above --max-kb, 2 when the build or the route is missing.
 */
import { existsSync, readFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { gzipSync } from 'node:zlib';

const here = dirname(fileURLToPath(import.meta.url));
const dist = resolve(here, '../dist');
const manifestPath = join(dist, '.vite/manifest.json');

function arg(name, fallback) {
  const i = process.argv.indexOf(name);
  return i >= 0 && process.argv[i + 1] ? process.argv[i + 1] : fallback;
}
const route = arg('--route', 'src/app/routes/station.tsx');
const maxKb = Number(arg('--max-kb', '300'));
const asJson = process.argv.includes('--json');

if (!existsSync(manifestPath)) {
  console.error(`No build manifest at ${manifestPath}. Run \`npm run build -w station-ui\` first (vite.config.ts sets build.manifest).`);
  process.exit(2);
}
if (!Number.isFinite(maxKb) || maxKb <= 0) {
  console.error(`--max-kb must be a positive number, got ${arg('--max-kb', '')}`);
  process.exit(2);
}

/** @type {Record<string, {file: string, isEntry?: boolean, isDynamicEntry?: boolean, imports?: string[], css?: string[]}>} */
const manifest = JSON.parse(readFileSync(manifestPath, 'utf8'));
const entryKey = Object.keys(manifest).find((k) => manifest[k].isEntry);
if (!entryKey) {
  console.error('The manifest names no entry chunk.');
  process.exit(2);
}
if (!manifest[route]) {
  const routes = Object.keys(manifest).filter((k) => k.startsWith('src/app/routes/'));
  console.error(`The manifest has no chunk for ${route}. Routes in this build:\n  ${routes.join('\n  ')}`);
  process.exit(2);
}

/** The chunk and everything it imports statically (what the browser fetches before running it). */
function closure(key, seen = new Set()) {
  if (seen.has(key)) return seen;
  seen.add(key);
  for (const dep of manifest[key]?.imports ?? []) closure(dep, seen);
  return seen;
}
const keys = [...closure(route, closure(entryKey))];

const rows = keys.map((key) => {
  const file = manifest[key].file;
  const bytes = readFileSync(join(dist, file));
  return { chunk: key, file, rawKb: bytes.length / 1000, gzipKb: gzipSync(bytes, { level: 9 }).length / 1000 };
});
const css = [...new Set(keys.flatMap((k) => manifest[k].css ?? []))].map((file) => {
  const bytes = readFileSync(join(dist, file));
  return { file, rawKb: bytes.length / 1000, gzipKb: gzipSync(bytes, { level: 9 }).length / 1000 };
});
const totalGzipKb = rows.reduce((s, r) => s + r.gzipKb, 0);
const totalRawKb = rows.reduce((s, r) => s + r.rawKb, 0);
const cssGzipKb = css.reduce((s, r) => s + r.gzipKb, 0);

if (asJson) {
  console.log(JSON.stringify({ route, entry: entryKey, chunks: rows, css, totalRawKb, totalGzipKb, cssGzipKb, maxKb }, null, 2));
} else {
  console.log(`JavaScript loaded by ${route} (entry ${entryKey}):`);
  for (const r of rows.sort((a, b) => b.gzipKb - a.gzipKb)) {
    console.log(`  ${r.gzipKb.toFixed(2).padStart(8)} kB gzip  ${r.rawKb.toFixed(2).padStart(8)} kB  ${r.file}`);
  }
  console.log(`  ${totalGzipKb.toFixed(2).padStart(8)} kB gzip  ${totalRawKb.toFixed(2).padStart(8)} kB  total JS (target < ${maxKb} kB gzip)`);
  console.log(`  ${cssGzipKb.toFixed(2).padStart(8)} kB gzip  CSS of the same chunks (not counted in the target)`);
}
process.exit(totalGzipKb > maxKb ? 1 : 0);
