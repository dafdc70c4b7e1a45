// Real-browser tests of the Radiator tab's "Optimize thicknesses": the film thickness search
// in the background worker on the default stack (progress, the answer applied, the figures
// against `glowgap eval LINK --radiator`), Cancel leaving the stack as it was, Revert, and
// the messages for a bad target or thickness. Prints the search's wall time in the page for
// 3 and 5 layers (not asserted: the machines are shared). Run by .ci/test with the others.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { useBrowser, rendered, radiatorFigures, cliRadiatorFigures, artifact, renders } from './harness.mjs';

const env = useBrowser({ viewport: { width: 1400, height: 1000 } });

async function act(page, fn) {
  const n = await renders(page);
  await fn();
  await rendered(page, n + 1);
}

/** Wait until the link holds the same stack as the table and the figures are settled. */
async function settled(page) {
  await page.waitForTimeout(150);
  await page.waitForFunction(() => document.querySelector('[data-metric="net-power"]')?.textContent.includes('W/m²'));
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
    return rows;
  });
}

/** Record every progress text the search shows (they may pass quickly). */
async function watchProgress(page) {
  await page.evaluate(() => {
    window.__filmProgress = [];
    const el = document.querySelector('[data-progress="film-optimize"] .search-count');
    new MutationObserver(() => window.__filmProgress.push(el.textContent)).observe(el, { childList: true, characterData: true, subtree: true });
  });
}

/** Start a search and wait for its answer; returns what the page says of it. */
async function search(page) {
  await watchProgress(page);
  await page.locator('[data-action="film-optimize"]').click();
  const result = page.locator('[data-info="film-optimize"]');
  await result.waitFor({ state: 'visible', timeout: 60000 });
  await settled(page);
  const progress = await page.evaluate(() => window.__filmProgress);
  return {
    ms: Number(await result.getAttribute('data-ms')),
    evaluations: Number(await result.getAttribute('data-evaluations')),
    variables: Number(await result.getAttribute('data-variables')),
    text: await result.innerText(),
    progress,
  };
}

async function layersOpen() {
  const f = await env.fresh();
  const { page } = f;
  const tab = page.locator('[data-panel="radiator"]');
  if ((await tab.getAttribute('aria-selected')) !== 'true') await act(page, () => tab.click());
  await page.waitForFunction(() => document.querySelector('[data-metric="net-power"]')?.textContent.includes('W/m²'));
  await act(page, () => page.locator('[data-emitter="layers"]').click());
  await page.locator('[data-slot="optimize-thicknesses"]').waitFor({ state: 'visible' });
  await settled(page);
  return f;
}

test('optimize thicknesses: net power on the default stack, applied, figures as the command line gives them, revert', async () => {
  const { context, page } = await layersOpen();
  const start = await table(page);
  const startLink = page.url();
  assert.deepEqual(start, [['hfo2', '50'], ['al2o3-ir', '800'], ['silica-ir', '1200']]);
  assert.equal(await page.locator('[data-control="film-target"]').inputValue(), 'net-power');
  assert.equal(await page.locator('[data-control="film-max-thickness"]').inputValue(), '2000');

  const r = await search(page);
  console.log(`film thickness search in the page, ${r.variables} layers: ${r.ms.toFixed(0)} ms wall time, ${r.evaluations} evaluations`);
  assert.equal(r.variables, 3);
  assert.ok(r.evaluations > 100, `evaluations ${r.evaluations}`);
  assert.ok(r.progress.some((t) => /stacks evaluated|Starting/.test(t)), `progress shown: ${JSON.stringify(r.progress)}`);
  assert.match(r.text, /net cooling power at ambient -?[\d.]+ W\/m²/);
  const found = await table(page);
  assert.notDeepEqual(found, start, 'the search changed the thicknesses');
  assert.deepEqual(found.map((x) => x[0]), start.map((x) => x[0]), 'materials and order kept');
  for (const [, d] of found) assert.ok(Number(d) >= 0 && Number(d) <= 2000, `thickness ${d} within 0-2000 nm`);
  // the table of the answer says the same thicknesses as the layer table
  const shown = await page.locator('[data-found]').allInnerTexts();
  assert.deepEqual(shown, found.map((x) => x[1]));
  // the link holds the answer, and its figures are the command line's
  assert.notEqual(page.url(), startLink);
  const figs = await radiatorFigures(page);
  assert.deepEqual(figs, cliRadiatorFigures(page.url()));
  // the card repeats the full evaluation's net power, as the figures show it
  assert.ok((await page.locator('[data-info="film-optimize-full"]').innerText()).includes(figs['net-power']));
  // the answer is at least as good as the start in the full evaluation too (the search
  // starts from the stack as it was)
  const net = (link) => Number(cliRadiatorFigures(link)['net-power'].split(' ')[0]);
  assert.ok(net(page.url()) >= net(startLink) - 0.5, `net power ${net(page.url())} vs ${net(startLink)} W/m²`);

  const card = page.locator('[data-slot="optimize-thicknesses"]');
  await card.scrollIntoViewIfNeeded();
  await card.screenshot({ path: artifact('film-optimize.png') });

  // revert: the thicknesses from before the search
  await act(page, () => page.locator('[data-action="revert-film-optimize"]').click());
  await settled(page);
  assert.deepEqual(await table(page), start);
  assert.match(await page.locator('[data-info="film-optimize-note"]').innerText(), /before the search are back/);
  assert.ok(await page.locator('[data-action="revert-film-optimize"]').isHidden());

  // five layers: two more after layer 3
  await page.locator('[data-control="layer-3-nm"]').focus();
  await act(page, () => page.locator('[data-action="add-layer"]').click());
  await act(page, () => page.locator('[data-action="add-layer"]').click());
  await settled(page);
  assert.equal((await table(page)).length, 5);
  const r5 = await search(page);
  console.log(`film thickness search in the page, ${r5.variables} layers: ${r5.ms.toFixed(0)} ms wall time, ${r5.evaluations} evaluations`);
  assert.equal(r5.variables, 5);
  assert.deepEqual(await radiatorFigures(page), cliRadiatorFigures(page.url()));
  await card.scrollIntoViewIfNeeded();
  await card.screenshot({ path: artifact('film-optimize-5.png') });
  await context.close();
});

test('optimize thicknesses: cancel leaves the stack, bad settings are named', async () => {
  const { context, page } = await layersOpen();
  const start = await table(page);
  const startLink = page.url();

  // a bad largest thickness: named, and nothing starts
  const max = page.locator('[data-control="film-max-thickness"]');
  await max.fill('abc');
  assert.match(await page.locator('[data-error="film-max-thickness"]').innerText(), /^Largest thickness: 'abc' is not a number/);
  await page.locator('[data-action="film-optimize"]').click();
  assert.ok(await page.locator('[data-progress="film-optimize"]').isHidden());
  await max.fill('50000');
  assert.match(await page.locator('[data-error="film-max-thickness"]').innerText(), /^The largest thickness 50000 nm is out of range.*1 to 20000 nm/);

  // a bad target emissivity: named under its field
  await page.locator('[data-control="film-target"]').selectOption('spectrum');
  const prof = page.locator('[data-control="film-target-profile"]');
  await prof.waitFor({ state: 'visible' });
  assert.equal(await prof.inputValue(), 'window:8-13');
  await prof.fill('window:13');
  assert.match(await page.locator('[data-error="film-target-profile"]').innerText(), /^Target emissivity: .*window/);
  await prof.fill('window:8-13');
  assert.equal(await page.locator('[data-error="film-target-profile"]').innerText(), '');
  await page.locator('[data-control="film-target"]').selectOption('net-power');

  // cancel a long search (the largest thickness allowed: the finest grid) once it reports progress
  await max.fill('20000');
  assert.equal(await page.locator('[data-error="film-max-thickness"]').innerText(), '');
  await watchProgress(page);
  await page.locator('[data-action="film-optimize"]').click();
  await page.locator('[data-progress="film-optimize"]').waitFor({ state: 'visible' });
  await page.waitForFunction(() => /stacks evaluated/.test(document.querySelector('[data-progress="film-optimize"] .search-count').textContent), null, { timeout: 30000 });
  await page.locator('[data-action="cancel-film-optimize"]').click();
  assert.match(await page.locator('[data-info="film-optimize-note"]').innerText(), /cancelled; the layers are unchanged/);
  await page.waitForTimeout(300);
  assert.deepEqual(await table(page), start);
  assert.equal(page.url(), startLink);
  assert.ok(await page.locator('[data-info="film-optimize"]').count() === 0);

  // a search after a cancel runs in a new worker and finishes
  await max.fill('2000');
  const r = await search(page);
  assert.notDeepEqual(await table(page), start);
  assert.ok(r.evaluations > 100);
  await context.close();
});
