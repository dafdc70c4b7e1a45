// Real-browser tests of the Glowgap app: headless Debian Chromium against the release build
// served on 127.0.0.1. Run by .ci/test (the README's test command).
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import fs from 'node:fs';
import { serve, launch, newPage, rendered, figures, cliFigures, artifact } from './harness.mjs';

let server, browser;
before(async () => {
  assert.ok(fs.existsSync(process.env.GLOWGAP_DIST || new URL('../../dist/index.html', import.meta.url)), 'run trunk build --release first');
  server = await serve(0);
  browser = await launch();
});
after(async () => {
  await browser?.close();
  await server?.close();
});

async function fresh(url = server.url) {
  const context = await browser.newContext({ viewport: { width: 1400, height: 1000 } });
  const page = await newPage(context);
  await page.goto(url);
  await rendered(page);
  return { context, page };
}

test('mounts without console errors and shows the core figures for the default scenario', async () => {
  const { context, page } = await fresh();
  const shown = await figures(page);
  // the command line computes the same scenario from the page's own link
  const link = await page.evaluate(() => location.href);
  assert.match(link, /#g1\./, 'the address bar holds a share link from the first render');
  assert.deepEqual(shown, cliFigures(link));
  // Ruhle 2016: 33.7% at 1.34 eV under AM1.5G at 300 K
  assert.equal(shown.efficiency, '33.68 %');
  await page.screenshot({ path: artifact('default-view.png'), fullPage: true });
  assert.deepEqual(page.errors, []);
  await context.close();
});

test('arrow keys step the gap by 1 meV (Shift: 10 meV) and update figures and link', async () => {
  const { context, page } = await fresh();
  const gap = page.locator('[data-control="gap"]').first();
  const before = await figures(page);
  const url0 = page.url();
  await gap.focus();
  const n0 = Number(await page.evaluate(() => document.body.dataset.renders));
  await page.keyboard.press('ArrowUp');
  await rendered(page, n0 + 1);
  const v1 = parseFloat(await gap.inputValue());
  assert.ok(Math.abs(v1 - 1.341) < 1e-9, `gap after ArrowUp: ${v1}`);
  await page.keyboard.press('Shift+ArrowDown');
  await rendered(page, n0 + 2);
  const v2 = parseFloat(await gap.inputValue());
  assert.ok(Math.abs(v2 - 1.331) < 1e-9, `gap after Shift+ArrowDown: ${v2}`);
  const after = await figures(page);
  assert.notDeepEqual(after, before);
  assert.notEqual(page.url(), url0);
  assert.deepEqual(after, cliFigures(page.url()));
  assert.deepEqual(page.errors, []);
  await context.close();
});

test('dragging on the spectrum plot moves the gap, and the link reopens identically', async () => {
  const { context, page } = await fresh();
  const before = await figures(page);
  const plot = page.locator('[data-plot="spectrum"]').first();
  const box = await plot.boundingBox();
  const y = box.y + box.height * 0.5;
  const n0 = Number(await page.evaluate(() => document.body.dataset.renders));
  await page.mouse.move(box.x + box.width * 0.45, y);
  await page.mouse.down();
  for (let i = 1; i <= 6; i++) await page.mouse.move(box.x + box.width * (0.45 + 0.03 * i), y);
  await page.mouse.up();
  await rendered(page, n0 + 1);
  const after = await figures(page);
  assert.notDeepEqual(after, before, 'a drag changes the figures');
  const link = page.url();
  await page.screenshot({ path: artifact('edited-view.png'), fullPage: true });

  // a new page (no saved state in a new context) opened on that link shows the same figures
  const second = await fresh(link);
  assert.deepEqual(await figures(second.page), after);
  assert.equal(second.page.url(), link);
  assert.deepEqual(cliFigures(link), after);
  assert.deepEqual(page.errors, []);
  assert.deepEqual(second.page.errors, []);
  await second.context.close();
  await context.close();
});

test('a garbled link opens a working page with a notice', async () => {
  for (const frag of ['#g1.this-is-not-a-scenario', '#g9.AAAA', '#g1.']) {
    const { context, page } = await fresh(server.url + frag);
    const notice = page.locator('[data-notice="link"]').first();
    await notice.waitFor({ state: 'visible' });
    assert.ok((await notice.innerText()).length > 10, 'the notice says what happened');
    assert.equal((await figures(page)).efficiency, '33.68 %', 'default scenario shown');
    await context.close();
  }
});

test('a bad spectrum file shows its error and keeps the previous result', async () => {
  const { context, page } = await fresh();
  const before = await figures(page);
  const input = page.locator('[data-control="spectrum-file"]').first();
  await input.setInputFiles({
    name: 'broken.csv',
    mimeType: 'text/csv',
    buffer: Buffer.from('wavelength_nm,irradiance_W_m2_nm\n400,1\n500,abc\n600,2\n'),
  });
  const err = page.locator('[data-error="spectrum"]').first();
  await err.waitFor({ state: 'visible' });
  assert.match(await err.innerText(), /line 3/);
  assert.deepEqual(await figures(page), before);
  await context.close();
});

test('a good spectrum file becomes the source', async () => {
  const { context, page } = await fresh();
  const input = page.locator('[data-control="spectrum-file"]').first();
  const n0 = Number(await page.evaluate(() => document.body.dataset.renders));
  await input.setInputFiles({
    name: 'triangle.csv',
    mimeType: 'text/csv',
    buffer: Buffer.from('wavelength_nm,irradiance_W_m2_nm\n600,0\n625,2\n650,4\n675,2\n700,0\n'),
  });
  await rendered(page, n0 + 1);
  // triangle of 4 W m^-2 nm^-1 over 100 nm: 200 W/m^2 (exact under the trapezoid rule)
  assert.equal((await figures(page))['input-power'], '200.0 W/m²');
  assert.deepEqual(cliFigures(page.url()), await figures(page));
  await context.close();
});

test('after one visit the app loads and computes with the server stopped', async () => {
  const own = await serve(0);
  const context = await browser.newContext({ viewport: { width: 1200, height: 900 } });
  const page = await newPage(context);
  await page.goto(own.url);
  await rendered(page);
  await page.evaluate(async () => {
    const reg = await navigator.serviceWorker.ready;
    // wait until the worker controls the page
    if (!navigator.serviceWorker.controller) {
      await new Promise((r) => navigator.serviceWorker.addEventListener('controllerchange', r, { once: true }));
    }
    return reg.active?.state;
  });
  // give the worker a moment to finish precaching
  await page.waitForFunction(async () => (await caches.keys()).length > 0, null, { timeout: 10000 });
  await own.close();
  await page.reload();
  await rendered(page);
  assert.equal((await figures(page)).efficiency, '33.68 %');
  await context.close();
});
