// Shared pieces of the browser tests: a static server for dist/ on 127.0.0.1, headless
// Debian Chromium through playwright-core, and the command-line figures to compare with.
import http from 'node:http';
import fs from 'node:fs';
import path from 'node:path';
import { execFileSync } from 'node:child_process';
import { chromium } from 'playwright-core';

export const DIST = process.env.GLOWGAP_DIST || path.resolve(import.meta.dirname, '../../dist');
export const CLI = process.env.GLOWGAP_CLI || path.resolve(import.meta.dirname, '../../target/release/glowgap');
export const ARTIFACTS = path.resolve(import.meta.dirname, '../artifacts');

const TYPES = {
  '.html': 'text/html; charset=utf-8', '.js': 'text/javascript', '.mjs': 'text/javascript',
  '.wasm': 'application/wasm', '.css': 'text/css', '.json': 'application/json',
  '.webmanifest': 'application/manifest+json', '.svg': 'image/svg+xml', '.png': 'image/png',
};

/** Serve DIST on 127.0.0.1 at `port` (0 = any free port). Resolves to {url, close}. */
export function serve(port = 0) {
  const server = http.createServer((req, res) => {
    const u = new URL(req.url, 'http://127.0.0.1');
    let p = path.join(DIST, decodeURIComponent(u.pathname));
    if (!p.startsWith(DIST)) { res.writeHead(403); return res.end(); }
    if (fs.existsSync(p) && fs.statSync(p).isDirectory()) p = path.join(p, 'index.html');
    if (!fs.existsSync(p)) { res.writeHead(404); return res.end('not found'); }
    res.writeHead(200, { 'content-type': TYPES[path.extname(p)] || 'application/octet-stream', 'cache-control': 'no-cache' });
    fs.createReadStream(p).pipe(res);
  });
  return new Promise((resolve) => {
    server.listen(port, '127.0.0.1', () => {
      const { port: actual } = server.address();
      resolve({
        url: `http://127.0.0.1:${actual}/`,
        port: actual,
        close: () => new Promise((r) => { server.closeAllConnections?.(); server.close(() => r()); }),
      });
    });
  });
}

export async function launch() {
  return chromium.launch({
    executablePath: process.env.GLOWGAP_CHROMIUM || '/usr/bin/chromium',
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run',
      '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
}

/** A new page that records console errors and page errors into `errors`. */
export async function newPage(context) {
  const page = await context.newPage();
  page.errors = [];
  page.on('console', (m) => { if (m.type() === 'error') page.errors.push(m.text()); });
  page.on('pageerror', (e) => page.errors.push(String(e)));
  return page;
}

/** Wait until the app has rendered at least `n` times since load. */
export async function rendered(page, n = 1) {
  await page.waitForFunction((k) => Number(document.body.dataset.renders || 0) >= k, n, { timeout: 20000 });
}

export const METRICS = ['efficiency', 'jsc', 'voc', 'ff', 'vmp', 'jmp', 'input-power'];

/** The headline figures as the page shows them. */
export async function figures(page) {
  const out = {};
  for (const m of METRICS) {
    out[m] = (await page.locator(`[data-metric="${m}"]`).first().innerText()).trim();
  }
  return out;
}

// CLI table labels of the headline figures (src/report.rs CELL_METRICS)
const LABELS = {
  'Efficiency': 'efficiency', 'Short-circuit current Jsc': 'jsc', 'Open-circuit voltage Voc': 'voc',
  'Fill factor': 'ff', 'Voltage at max power Vmp': 'vmp', 'Current at max power Jmp': 'jmp',
  'Incident power': 'input-power',
};

/** The figures `glowgap eval LINK` prints, keyed like the page's data-metric hooks. */
export function cliFigures(link) {
  const text = execFileSync(CLI, ['eval', link], { encoding: 'utf8' });
  const out = {};
  for (const line of text.split('\n')) {
    const label = line.slice(0, 28).trim();
    if (LABELS[label]) out[LABELS[label]] = line.slice(28).trim();
  }
  return out;
}

export function artifact(name) {
  fs.mkdirSync(ARTIFACTS, { recursive: true });
  return path.join(ARTIFACTS, name);
}
