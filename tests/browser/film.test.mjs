// Real-browser tests of the radiator's layer-stack emitter: the "Emitter: profile | layers"
// switch, the layer table, the bar diagram's keys and drag, the share link, and the figures
// against `glowgap eval LINK --radiator`. Prints the drag's redraw times (not asserted: the
// machines are shared). Run by .ci/test with the other browser tests.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { useBrowser, rendered, radiatorFigures, cliRadiatorFigures, artifact, renders } from './harness.mjs';

const env = useBrowser({ viewport: { width: 1400, height: 1000 }, acceptDownloads: true });

async function act(page, fn) {
  const n = await renders(page);
  await fn();
  await rendered(page, n + 1);
}

const filmRenders = (page) => page.evaluate(() => Number(document.body.dataset.filmRenders || 0));

/** Do `fn` and wait until the stack's plots have been drawn again. */
async function drawn(page, fn) {
  const n = await filmRenders(page);
  await fn();
  await page.waitForFunction((k) => Number(document.body.dataset.filmRenders || 0) > k, n, { timeout: 20000 });
}

/** Wait until the link holds the same stack as the table and the figures are settled. */
async function settled(page) {
  await page.waitForTimeout(150);
  await page.waitForFunction(() => document.querySelector('[data-metric="net-power"]')?.textContent.includes('W/m²'));
}

async function radiator(url) {
  const f = await env.fresh(url);
  const tab = f.page.locator('[data-panel="radiator"]');
  if ((await tab.getAttribute('aria-selected')) !== 'true') await act(f.page, () => tab.click());
  await f.page.waitForFunction(() => document.querySelector('[data-metric="net-power"]')?.textContent.includes('W/m²'));
  return f;
}

/** The table as [material, thickness] rows. */
async function table(page) {
  return page.evaluate(() => {
    const rows = [];
    for (let n = 1; ; n++) {
      const m = document.querySelector(`[data-control="layer-${n}-material"]`);
      if (!m) break;
      rows.push([m.value, document.querySelector(`[data-control="layer-${n}-nm"]`).value]);
    }
    rows.push(['substrate', document.querySelector('[data-control="film-substrate"]').value]);
    return rows;
  });
}

/** Layer top edges of the bar diagram in page coordinates. */
async function edges(page) {
  const c = page.locator('[data-control="film-stack"]');
  await c.scrollIntoViewIfNeeded();
  const box = await c.boundingBox();
  const attr = await c.getAttribute('data-edges');
  return attr.split(';').map((s) => s.split(',').map(Number)).map(([x, y]) => [box.x + x, box.y + y]);
}

function median(xs) {
  const s = [...xs].sort((a, b) => a - b);
  return s[s.length >> 1];
}

test('layers: switch, keys, drag, add and remove, link round trip, back to the profile', async () => {
  const { context, page } = await radiator();
  const profileLink = page.url();
  const profileFigures = await radiatorFigures(page);

  // switch to layers: the default stack, figures as the command line gives them
  await act(page, () => page.locator('[data-emitter="layers"]').click());
  await page.locator('[data-card="film-stack"]').waitFor({ state: 'visible' });
  await page.waitForFunction(() => (document.querySelector('[data-control="film-stack"]')?.getAttribute('data-edges') || '').length > 0);
  await settled(page);
  assert.equal(await page.locator('[data-emitter="layers"]').getAttribute('aria-pressed'), 'true');
  const start = await table(page);
  assert.deepEqual(start, [['hfo2', '50'], ['al2o3-ir', '800'], ['silica-ir', '1200'], ['substrate', 'ag']]);
  assert.deepEqual(await radiatorFigures(page), cliRadiatorFigures(page.url()));
  assert.match(await page.locator('.film-table .about').first().innerText(), /µm/);
  assert.match(await page.locator('.substrate-note').innerText(), /1 − R/);
  await page.screenshot({ path: artifact('film-layers.png'), fullPage: true });

  // keys on the bar diagram: the first press chooses layer 1, then ↑ thickens it, Shift+↑ more
  const canvas = page.locator('[data-control="film-stack"]');
  await canvas.focus();
  await page.keyboard.press('ArrowUp');
  await page.keyboard.press(']');
  await act(page, () => page.keyboard.press('ArrowUp'));
  await act(page, () => page.keyboard.press('Shift+ArrowUp'));
  await settled(page);
  assert.equal((await table(page))[1][1], '810', 'layer 2: 800 nm, +1 nm, then +10 nm onto a multiple of 10');
  assert.deepEqual(await radiatorFigures(page), cliRadiatorFigures(page.url()));

  // drag layer 3's top edge up, timing each step from the edit to the redraw
  const [x, y] = (await edges(page))[2];
  await page.evaluate(() => { document.body.dataset.filmRedrawMs = ''; });
  await page.mouse.move(x, y);
  await page.mouse.down();
  for (let k = 1; k <= 20; k++) {
    await drawn(page, () => page.mouse.move(x, y - 2 * k));
  }
  await act(page, () => page.mouse.up());
  await settled(page);
  const ms = (await page.evaluate(() => document.body.dataset.filmRedrawMs || '')).split(',').filter(Boolean).map(Number);
  console.log(`film thickness drag, edit to drawn: median ${median(ms).toFixed(1)} ms, max ${Math.max(...ms).toFixed(1)} ms (n=${ms.length})`);
  const dragged = await table(page);
  assert.ok(Number(dragged[2][1]) > 1200, `the drag thickened layer 3: ${dragged[2][1]}`);
  assert.deepEqual(await radiatorFigures(page), cliRadiatorFigures(page.url()));

  // add a layer after the chosen one, then remove it
  await act(page, () => page.locator('[data-action="add-layer"]').click());
  assert.equal((await table(page)).length, 5);
  await act(page, () => page.locator('[data-action="layer-4-remove"]').click());
  assert.deepEqual(await table(page), dragged);
  // move a layer up and back down
  await act(page, () => page.locator('[data-action="layer-2-up"]').click());
  assert.equal((await table(page))[0][0], 'al2o3-ir');
  await act(page, () => page.locator('[data-action="layer-1-down"]').click());
  assert.deepEqual(await table(page), dragged);

  // bad input: a message beside the row, the stack in use unchanged
  const linkBefore = page.url();
  await page.locator('[data-control="layer-1-nm"]').fill('abc');
  const err = page.locator('[data-error="film-layers"]');
  await err.waitFor({ state: 'visible' });
  assert.match(await err.innerText(), /Layer 1 thickness.*not a thickness.*Still using 50 nm/);
  await page.locator('[data-control="layer-1-nm"]').fill('-5');
  assert.match(await err.innerText(), /layer 1.*out of range/i);
  await page.locator('[data-control="layer-2-material"]').fill('unobtainium');
  await page.locator('[data-control="layer-2-material"]').press('Enter');
  assert.match(await err.innerText(), /Layer 2 material.*not a material in the list/);
  assert.equal(page.url(), linkBefore, 'refused edits leave the link alone');
  await page.screenshot({ path: artifact('film-error.png'), fullPage: false });
  await page.locator('[data-control="layer-1-nm"]').fill('50');
  await page.locator('[data-control="layer-2-material"]').fill('al2o3-ir');
  await page.locator('[data-control="layer-2-material"]').press('Enter');
  await settled(page);
  assert.equal(await err.count(), 0);
  assert.deepEqual(await table(page), dragged);

  // hover read-outs
  const [hx, hy] = (await edges(page))[1];
  await page.mouse.move(hx, hy + 6);
  await page.locator('.tooltip').first().waitFor();
  assert.match(await page.locator('.tooltip').first().innerText(), /Layer 2 of 3: al2o3-ir, 810 nm/);
  const map = page.locator('[data-plot="film-map"]');
  await map.scrollIntoViewIfNeeded();
  const mb = await map.boundingBox();
  await page.mouse.move(mb.x + mb.width * 0.5, mb.y + mb.height * 0.4);
  await page.waitForFunction(() => [...document.querySelectorAll('.tooltip')].some((t) => /emissivity/.test(t.innerText) && /from the normal/.test(t.innerText)));
  await page.locator('[data-card="film-stack"]').screenshot({ path: artifact('film-stack-card.png') });
  await page.locator('[data-card="film-rta"]').screenshot({ path: artifact('film-rta-card.png') });
  await page.locator('[data-card="film-map"]').screenshot({ path: artifact('film-map-card.png') });

  // downloads
  for (const [slug, kind] of [['film-rta', 'csv'], ['film-map', 'csv'], ['film-rta', 'svg'], ['film-map', 'png']]) {
    const [dl] = await Promise.all([page.waitForEvent('download'), page.locator(`[data-action="download-${slug}-${kind}"]`).click()]);
    assert.equal(dl.suggestedFilename().endsWith(`.${kind}`), true);
    if (kind === 'csv') {
      const text = await (await dl.createReadStream()).toArray().then((b) => Buffer.concat(b).toString());
      assert.match(text, slug === 'film-rta' ? /^wavelength_um,reflectance,transmittance,absorptance,emissivity/m : /^wavelength_um,angle_deg,emissivity$/m);
    }
  }

  // the link reopens the same stack and figures
  const link = page.url();
  const figs = await radiatorFigures(page);
  const second = await radiator(link);
  await second.page.waitForFunction(() => (document.querySelector('[data-control="film-stack"]')?.getAttribute('data-edges') || '').length > 0);
  assert.deepEqual(await table(second.page), dragged);
  assert.deepEqual(await radiatorFigures(second.page), figs);
  assert.deepEqual(second.page.errors, []);
  await second.context.close();

  // back to the profile: the previous profile and its figures
  await act(page, () => page.locator('[data-emitter="profile"]').click());
  await settled(page);
  assert.equal(await page.locator('[data-card="film-stack"]').isVisible(), false);
  assert.deepEqual(await radiatorFigures(page), profileFigures);
  assert.equal(page.url(), profileLink);
  // and to layers again: the stack as the user left it
  await act(page, () => page.locator('[data-emitter="layers"]').click());
  assert.deepEqual(await table(page), dragged);

  assert.deepEqual(page.errors, []);
  await context.close();
});
