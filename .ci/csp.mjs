// Build step (trunk post_build hook, see Trunk.toml): put a strict content-security policy
// into the built page. Every inline script of the page (trunk's module loader, the
// offline-worker registration) is allowed by its SHA-256 hash, computed here from the
// exact text that ships, so no inline script other than these can run, and nothing may
// be loaded from or sent to another origin.
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';

const dir = process.env.TRUNK_STAGING_DIR;
if (!dir) {
  console.error('csp: TRUNK_STAGING_DIR is not set; run this through trunk (Trunk.toml [[hooks]])');
  process.exit(1);
}
const file = path.join(dir, 'index.html');
let html = fs.readFileSync(file, 'utf8');
if (html.includes('http-equiv="Content-Security-Policy"')) {
  html = html.replace(/\s*<meta http-equiv="Content-Security-Policy"[^>]*>/, '');
}

const hashes = [];
for (const m of html.matchAll(/<script(?![^>]*\bsrc=)[^>]*>([\s\S]*?)<\/script>/g)) {
  hashes.push(`'sha256-${createHash('sha256').update(m[1], 'utf8').digest('base64')}'`);
}

const POLICY = [
  "default-src 'self'",
  // the page's own scripts, WebAssembly compilation, and the inline scripts above by hash
  `script-src 'self' 'wasm-unsafe-eval' ${hashes.join(' ')}`.trim(),
  // the gap search's module worker is made from a blob that loads the page's own module
  "worker-src 'self' blob:",
  // leptos sets style attributes (plot read-outs, colour swatches)
  "style-src 'self' 'unsafe-inline'",
  // exported PNGs are data URLs; downloads are blob URLs
  "img-src 'self' data: blob:",
  "connect-src 'self'",
  "font-src 'self'",
  "manifest-src 'self'",
  "object-src 'none'",
  "base-uri 'none'",
  "form-action 'none'",
].join('; ');

const meta = `<meta http-equiv="Content-Security-Policy" content="${POLICY}">`;
// right after <meta charset>, before anything the policy governs
const at = html.search(/<meta charset[^>]*>/i);
if (at < 0) {
  console.error('csp: no <meta charset> in the built page; the policy must come first in <head>');
  process.exit(1);
}
const end = html.indexOf('>', at) + 1;
html = html.slice(0, end) + meta + html.slice(end);
fs.writeFileSync(file, html);
console.log(`csp: policy written with ${hashes.length} inline script hash(es)`);
