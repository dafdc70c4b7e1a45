// Real-browser tests of the page's hardening: a strict content-security policy in the built
// page, no policy violation while every tab is used (the harness fails any test on one), and
// share links that are data, never markup. Headless Chromium against the release build.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import fs from 'node:fs';
import path from 'node:path';
import zlib from 'node:zlib';
import { useBrowser, rendered, DIST } from './harness.mjs';

const env = useBrowser();

/** The policy of the built page, directive -> sources. */
function policy() {
  const html = fs.readFileSync(path.join(DIST, 'index.html'), 'utf8');
  const m = html.match(/<meta http-equiv="Content-Security-Policy" content="([^"]+)">/);
  assert.ok(m, 'the built page carries a content-security policy');
  // the policy comes before any script it governs
  assert.ok(html.indexOf(m[0]) < html.indexOf('<script'), 'the policy precedes every script');
  return Object.fromEntries(m[1].split(';').map((d) => d.trim().split(/\s+/)).map(([k, ...v]) => [k, v]));
}

test('the built page has a strict content-security policy', () => {
  const p = policy();
  const scripts = p['script-src'];
  assert.ok(scripts.includes("'self'"));
  assert.ok(!scripts.includes("'unsafe-inline'") && !scripts.includes("'unsafe-eval'"), 'no inline or eval scripts');
  assert.ok(scripts.some((s) => s.startsWith("'sha256-")), 'inline scripts are allowed by hash only');
  assert.deepEqual(p['object-src'], ["'none'"]);
  assert.deepEqual(p['base-uri'], ["'none'"]);
  // no connection to any other origin
  assert.deepEqual(p['connect-src'], ["'self'"]);
  assert.deepEqual(p['default-src'], ["'self'"]);
  for (const [k, v] of Object.entries(p)) {
    assert.ok(!v.some((s) => /^https?:|^\*$|^wss?:/.test(s)), `${k} names no other origin`);
  }
});

test('every tab works under the policy: edits, downloads, the map and the background search', async () => {
  const { context, page } = await env.fresh();
  const renders = () => page.evaluate(() => Number(document.body.dataset.renders || 0));
  // Solar cell: a gap edit and a download of each kind
  await page.locator('[data-control="gap"]').fill('1.1');
  await page.waitForFunction(() => /%$/.test(document.querySelector('[data-metric="efficiency"]').textContent));
  for (const kind of ['svg', 'png', 'csv']) {
    const [download] = await Promise.all([page.waitForEvent('download'), page.locator(`[data-action="download-jv-${kind}"]`).click()]);
    assert.match(download.suggestedFilename(), new RegExp(`^glowgap-jv\\.${kind}$`));
  }
  // Radiator
  let n0 = await renders();
  await page.locator('[data-panel="radiator"]').click();
  await rendered(page, n0 + 1);
  await page.waitForFunction(() => /W\/m²$/.test(document.querySelector('[data-metric="net-power"]')?.textContent || ''));
  await page.locator('[data-control="ambient"]').fill('290');
  await page.waitForFunction(() => /W\/m²$/.test(document.querySelector('[data-metric="net-power"]')?.textContent || ''));
  // Stack: the map, then the search in its worker, cancelled once it reports progress
  n0 = await renders();
  await page.locator('[data-panel="stack"]').click();
  await rendered(page, n0 + 1);
  await page.waitForFunction(() => /stacks in/.test(document.querySelector('[data-info="map-timing"]')?.textContent || ''), null, { timeout: 20000 });
  await page.locator('[data-action="optimize"]').click();
  await page.waitForFunction(() => /Best|stacks evaluated/.test(document.querySelector('.search-section')?.textContent || ''), null, { timeout: 30000 });
  assert.deepEqual(page.errors, [], 'no console error and no policy violation');
  await context.close();
});

/** A share link for a scenario document (the codec's format: #g1. + base64url(deflate(JSON))). */
function linkOf(doc) {
  const packed = zlib.deflateRawSync(Buffer.from(JSON.stringify(doc), 'utf8'), { level: 9 });
  return '#g1.' + packed.toString('base64url');
}

const MARKUP = '<img src=x onerror="window.__ran=1"><script>window.__ran=2</script><b>bold</b>';

/** `doc` with every name-like string field replaced by markup. */
function withMarkup(doc) {
  const walk = (o) => {
    if (Array.isArray(o)) return o.forEach(walk);
    if (o && typeof o === 'object') {
      for (const [k, v] of Object.entries(o)) {
        if (typeof v === 'string' && /name|label|path|provenance/.test(k)) o[k] = `${MARKUP} ${k}`;
        else walk(v);
      }
    }
  };
  const copy = structuredClone(doc);
  walk(copy);
  return copy;
}

// page-radiator-panel names a user spectrum, emissivity, sky and EQE table, all shown on the
// page; page-stack-panel's only names are the mismatch tables', which the page does not show
for (const [fixture, shows] of [['page-radiator-panel', true], ['page-stack-panel', false]]) {
  test(`a link whose text fields carry HTML and script (${fixture}) shows them as text and runs nothing`, async () => {
    const doc = JSON.parse(fs.readFileSync(path.resolve(import.meta.dirname, `../fixtures/links/${fixture}.scenario.json`), 'utf8'));
    const hostile = withMarkup(doc);
    const { context, page } = await env.fresh();
    const base = page.url().split('#')[0];
    await page.goto('about:blank');
    const dialogs = [];
    page.on('dialog', (d) => { dialogs.push(d.message()); d.dismiss(); });
    await page.goto(base + linkOf(hostile));
    await rendered(page);
    for (const tab of ['cell', 'radiator', 'stack']) {
      const n0 = await page.evaluate(() => Number(document.body.dataset.renders || 0));
      await page.locator(`[data-panel="${tab}"]`).click();
      await page.waitForFunction((k) => Number(document.body.dataset.renders || 0) > k, n0).catch(() => {});
    }
    assert.equal(await page.evaluate(() => window.__ran), undefined, 'no injected script or handler ran');
    assert.equal(await page.locator('img[src="x"]').count(), 0, 'no injected element');
    assert.equal(await page.locator('b:text("bold")').count(), 0, 'no injected markup');
    assert.deepEqual(dialogs, []);
    // the text is shown as text somewhere on the page (a table's name)
    await page.locator('[data-panel="cell"]').click();
    const shown = await page.evaluate(() => document.body.innerText.includes('<img src=x'));
    const inValues = await page.evaluate(() => [...document.querySelectorAll('option, input')].some((e) => (e.textContent + e.value).includes('<img src=x')));
    if (shows) assert.ok(shown || inValues, 'the markup is displayed as plain text');
    assert.match(await page.locator('[data-metric="efficiency"]').innerText(), /%$/, 'the page works');
    assert.deepEqual(page.errors, []);
    await context.close();
  });
}
