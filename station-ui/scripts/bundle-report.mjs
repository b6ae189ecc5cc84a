#!/usr/bin/env node
/**
 * What each screen downloads before it can show anything, gzipped: the entry chunk, the screen's lazy route
 * chunks (for a page inside the app shell: the shell's route chunk too) and every chunk they import
 * statically, with their CSS; read from Vite's build manifest (dist/.vite/manifest.json, `build.manifest`).
 *
 *   node scripts/bundle-report.mjs                       # every route, sign-in first, and its chunks
 *   node scripts/bundle-report.mjs --max-sign-in-kb 120  # exit 1 when /sign-in's JavaScript is above that
 *   npm run bench:bundle -w station-ui                   # the same after a build
 *
 * Sizes: gzip at level 9 (zlib), kB = 1000 bytes, as Vite's own build report. Exit 2 when the build is missing.
 */
import { existsSync, readFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { gzipSync } from 'node:zlib';

const here = dirname(fileURLToPath(import.meta.url));
const dist = resolve(here, '../dist');
const manifestPath = join(dist, '.vite/manifest.json');
const i = process.argv.indexOf('--max-sign-in-kb');
const maxSignInKb = i >= 0 ? Number(process.argv[i + 1]) : undefined;

if (!existsSync(manifestPath)) {
  console.error(`No build manifest at ${manifestPath}. Run \`npm run build -w station-ui\` first (vite.config.ts sets build.manifest).`);
  process.exit(2);
}

/** @type {Record<string, {file: string, isEntry?: boolean, isDynamicEntry?: boolean, imports?: string[], css?: string[]}>} */
const manifest = JSON.parse(readFileSync(manifestPath, 'utf8'));
const entryKey = Object.keys(manifest).find((k) => manifest[k].isEntry);
const SHELL = 'src/app/routes/app-root.tsx';
const SIGN_IN = 'src/app/routes/sign-in.tsx';

/** The chunk and everything it imports statically (what the browser fetches before running it). */
function closure(key, seen = new Set()) {
  if (seen.has(key) || !manifest[key]) return seen;
  seen.add(key);
  for (const dep of manifest[key].imports ?? []) closure(dep, seen);
  return seen;
}

const sizes = new Map();
function size(file) {
  if (!sizes.has(file)) {
    const bytes = readFileSync(join(dist, file));
    sizes.set(file, { raw: bytes.length / 1000, gzip: gzipSync(bytes, { level: 9 }).length / 1000 });
  }
  return sizes.get(file);
}

/** JS and CSS a route loads: entry, the shell when the page lives inside it (and is its own chunk), the route. */
function load(route) {
  const keys = closure(entryKey);
  if (route !== SIGN_IN && manifest[SHELL]) closure(SHELL, keys);
  closure(route, keys);
  const js = [...keys].map((k) => ({ key: k, file: manifest[k].file, ...size(manifest[k].file) }));
  const css = [...new Set([...keys].flatMap((k) => manifest[k].css ?? []))].map((file) => ({ file, ...size(file) }));
  const sum = (xs, f) => xs.reduce((s, x) => s + x[f], 0);
  return { route, js, css, jsGzip: sum(js, 'gzip'), jsRaw: sum(js, 'raw'), cssGzip: sum(css, 'gzip') };
}

const routes = Object.keys(manifest)
  .filter((k) => k.startsWith('src/app/routes/') && !k.endsWith('app-root.tsx'))
  .sort((a, b) => (a === SIGN_IN ? -1 : b === SIGN_IN ? 1 : a.localeCompare(b)));

console.log(`Build ${dist} (entry ${entryKey}); gzip level 9, kB = 1000 bytes`);
console.log(`${'route'.padEnd(44)} ${'JS gzip'.padStart(9)} ${'JS raw'.padStart(9)} ${'CSS gzip'.padStart(9)}  chunks`);
let signIn;
for (const route of routes) {
  const r = load(route);
  if (route === SIGN_IN) signIn = r;
  console.log(`${route.replace('src/app/routes/', '').padEnd(44)} ${r.jsGzip.toFixed(1).padStart(9)} ${r.jsRaw.toFixed(1).padStart(9)} ${r.cssGzip.toFixed(1).padStart(9)}  ${r.js.length}`);
}
if (signIn) {
  console.log('\n/sign-in loads:');
  for (const c of signIn.js.sort((a, b) => b.gzip - a.gzip)) console.log(`  ${c.gzip.toFixed(2).padStart(8)} kB gzip  ${c.raw.toFixed(2).padStart(8)} kB  ${c.file}  (${c.key})`);
  for (const c of signIn.css) console.log(`  ${c.gzip.toFixed(2).padStart(8)} kB gzip  ${c.raw.toFixed(2).padStart(8)} kB  ${c.file}`);
}
if (maxSignInKb !== undefined && signIn && signIn.jsGzip > maxSignInKb) {
  console.error(`/sign-in loads ${signIn.jsGzip.toFixed(1)} kB gzip of JavaScript, above ${maxSignInKb} kB`);
  process.exit(1);
}
