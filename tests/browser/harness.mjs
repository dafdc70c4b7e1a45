// Shared pieces of the browser tests: a static server for dist/ on 127.0.0.1, headless
// Debian Chromium through playwright-core, and the command-line figures to compare with.
import http from 'node:http';
import fs from 'node:fs';
import path from 'node:path';
import { execFileSync } from 'node:child_process';
import { before, after } from 'node:test';
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

/**
 * A new page that records console errors, page errors and content-security-policy
 * violations into `errors` (every test ends by asserting it is empty, so a violation
 * anywhere fails the test that caused it).
 */
export async function newPage(context) {
  const page = await context.newPage();
  page.errors = [];
  page.on('console', (m) => { if (m.type() === 'error') page.errors.push(m.text()); });
  page.on('pageerror', (e) => page.errors.push(String(e)));
  await page.addInitScript(() => {
    document.addEventListener('securitypolicyviolation', (e) => {
      console.error(`content-security-policy violation: ${e.violatedDirective} blocked ${e.blockedURI || 'inline'}`);
    });
  });
  return page;
}

/** How many times the app has rendered since load. */
export const renders = (page) => page.evaluate(() => Number(document.body.dataset.renders || 0));

/** Do `action`, then wait for the page to render and the link to change. */
export async function edit(page, action) {
  const url0 = page.url();
  const n0 = await renders(page);
  await action();
  await rendered(page, n0 + 1);
  await page.waitForFunction((u) => location.href !== u, url0, { timeout: 10000 });
}

/** Wait until the app has rendered at least `n` times since load. */
export async function rendered(page, n = 1) {
  await page.waitForFunction((k) => Number(document.body.dataset.renders || 0) >= k, n, { timeout: 20000 });
}

export const METRICS = ['efficiency', 'jsc', 'voc', 'ff', 'vmp', 'jmp', 'input-power'];

/** The text of each `data-metric` hook in `hooks`, as the page shows it. */
export async function readMetrics(page, hooks) {
  const out = {};
  for (const m of hooks) {
    out[m] = (await page.locator(`[data-metric="${m}"]`).first().innerText()).trim();
  }
  return out;
}

/** The headline figures as the page shows them. */
export const figures = (page) => readMetrics(page, METRICS);

// CLI table labels of the headline figures (src/report.rs CellMetric::label)
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

/**
 * A test file's server and browser, started before its tests and stopped after them.
 * `fresh(url)` opens `url` in a new context (no saved state) and waits for the first render.
 */
export function useBrowser(contextOptions = { viewport: { width: 1400, height: 1000 } }) {
  const env = {};
  before(async () => {
    if (!fs.existsSync(path.join(DIST, 'index.html'))) throw new Error(`no ${DIST}/index.html: run trunk build --release first`);
    env.server = await serve(0);
    env.browser = await launch();
  });
  after(async () => {
    await env.browser?.close();
    await env.server?.close();
  });
  env.fresh = async (url = env.server.url) => {
    const context = await env.browser.newContext(contextOptions);
    const page = await newPage(context);
    await page.goto(url);
    await rendered(page);
    return { context, page };
  };
  return env;
}

export function artifact(name) {
  fs.mkdirSync(ARTIFACTS, { recursive: true });
  return path.join(ARTIFACTS, name);
}

// ---- the radiator panel ----

/** The radiator's figures (src/report/radiator.rs RADIATOR_METRICS and RADIATOR_PARTS). */
export const RADIATOR_METRICS = ['net-power', 'steady-temp', 'solar-reflectance', 'thermal-emittance', 'window-emissivity',
  'sky-emissivity', 'emitted', 'sky-absorbed', 'sun-absorbed', 'parasitic'];

/** The radiator's figures as the page shows them. */
export const radiatorFigures = (page) => readMetrics(page, RADIATOR_METRICS);

// CLI table rows of the radiator (RadiatorReport::rows): exact labels, and label prefixes
const RADIATOR_LABELS = {
  'Net cooling power': 'net-power', 'Steady temperature': 'steady-temp', 'Solar reflectance (AM1.5G)': 'solar-reflectance',
  'Sky broadband emissivity': 'sky-emissivity', 'Emitted': 'emitted', 'Absorbed from the sky': 'sky-absorbed',
  'Absorbed from the sun': 'sun-absorbed', 'Gained from the air': 'parasitic',
};
const RADIATOR_PREFIXES = { 'Thermal emittance (': 'thermal-emittance', '8-13 um emissivity (': 'window-emissivity' };

/** The figures `glowgap eval LINK --radiator` prints, keyed like the page's data-metric hooks
 * (the steady temperature without its note, as the page's figure shows it). */
export function cliRadiatorFigures(link) {
  const text = execFileSync(CLI, ['eval', link, '--radiator'], { encoding: 'utf8' });
  const out = {};
  for (const line of text.split('\n')) {
    const label = line.slice(0, 32).trim();
    const value = line.slice(33).trim();
    let hook = RADIATOR_LABELS[label];
    for (const [p, h] of Object.entries(RADIATOR_PREFIXES)) if (label.startsWith(p)) hook = h;
    if (!hook) continue;
    out[hook] = hook === 'steady-temp' ? value.split(' (')[0].split(':')[0] : value;
  }
  return out;
}

// ---- the stack panel ----

/** The stack's headline figures (src/report/stack.rs StackMetric). */
export const STACK_METRICS = ['stack-efficiency', 'stack-voc', 'stack-jsc'];

/** The stack's figures as the page shows them. */
export const stackFigures = (page) => readMetrics(page, STACK_METRICS);

// CLI table labels of the stack's figures (src/cli/stack.rs write_stack_table)
const STACK_LABELS = {
  'Efficiency': 'stack-efficiency', 'Open-circuit voltage Voc': 'stack-voc',
  'Short-circuit current Jsc': 'stack-jsc', 'Sum of subcell Jsc': 'stack-jsc',
};

/** The figures `glowgap eval LINK --stack` prints, keyed like the page's data-metric hooks. */
export function cliStackFigures(link) {
  const text = execFileSync(CLI, ['eval', link, '--stack'], { encoding: 'utf8' });
  const out = {};
  for (const line of text.split('\n')) {
    const hook = STACK_LABELS[line.slice(0, 28).trim()];
    if (hook) out[hook] = line.slice(28).trim();
  }
  return out;
}

/** Where a plot's axes landed (its canvas' data-frame): CSS px and axis ranges. */
export async function plotFrame(page, plot) {
  return JSON.parse(await page.locator(`[data-plot="${plot}"]`).first().getAttribute('data-frame'));
}

