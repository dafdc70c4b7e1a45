// Real-browser tests of the hot-emitter panel (blackbody, TPV pair, solar-thermal
// absorber): headless Debian Chromium against the release build served on 127.0.0.1,
// figures checked against the command line's JSON (`glowgap blackbody`, `glowgap tpv`).
// Run by .ci/test with the other browser tests.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { execFileSync } from 'node:child_process';
import { useBrowser, rendered, renders, artifact, CLI } from './harness.mjs';

const env = useBrowser({ viewport: { width: 1400, height: 1000 }, acceptDownloads: true });

/** Do `fn` and wait until the page has rendered `k` more times. */
async function act(page, fn, k = 1) {
  const n = await renders(page);
  await fn();
  await rendered(page, n + k);
}

/** A fresh page on `url` with the hot-emitter panel in front and computed. */
async function hot(url) {
  const f = await env.fresh(url);
  const tab = f.page.locator('[data-panel="hot"]');
  if ((await tab.getAttribute('aria-selected')) !== 'true') await act(f.page, () => tab.click(), 3);
  await f.page.waitForFunction(() => ['bb-peak-um', 'tpv-efficiency', 'abs-work-efficiency']
    .every((h) => document.querySelector(`[data-metric="${h}"]`)?.textContent.trim()));
  return f;
}

const metric = async (page, hook) => (await page.locator(`[data-metric="${hook}"]`).first().innerText()).trim();
const number = (text) => Number(text.replace('−', '-').replace(/[^0-9eE.+-].*$/, ''));
const cli = (args) => JSON.parse(execFileSync(CLI, args, { encoding: 'utf8' }));

function median(xs) {
  const s = [...xs].sort((a, b) => a - b);
  return s[s.length >> 1];
}

/** Drag the range input `hook` in `steps` mouse moves, timing each from the edit to the redraw. */
async function dragSlider(page, hook, steps, rendersPerStep) {
  const slider = page.locator(`[data-control="${hook}"]`);
  await slider.scrollIntoViewIfNeeded();
  const box = await slider.boundingBox();
  const value = Number(await slider.inputValue());
  const [lo, hi] = [Number(await slider.getAttribute('min')), Number(await slider.getAttribute('max'))];
  const x0 = box.x + 8 + (box.width - 16) * (value - lo) / (hi - lo);
  const y = box.y + box.height / 2;
  await page.mouse.move(x0, y);
  await page.mouse.down();
  await page.waitForTimeout(150);
  const lat = [];
  for (let i = 1; i <= steps; i++) {
    await page.evaluate(() => performance.clearMarks());
    await act(page, () => page.mouse.move(x0 + 2 * i, y), 1);
    // every card the edit touches has drawn (`rendersPerStep` effects run in one flush)
    await page.waitForTimeout(60 * rendersPerStep);
    lat.push(await page.evaluate(() => {
      const a = performance.getEntriesByName('gg-edit').pop();
      const b = performance.getEntriesByName('gg-drawn').pop();
      return a && b ? b.startTime - a.startTime : NaN;
    }));
  }
  await page.mouse.up();
  return lat;
}

test('the Hot emitters tab shows the three cards with the command line\'s figures, and its link reopens it', async () => {
  const { context, page } = await hot();
  const link = page.url();
  assert.equal(await page.locator('[data-panel="hot"]').getAttribute('aria-selected'), 'true');
  for (const slug of ['blackbody-spectrum', 'tpv-exchange', 'tpv-jv', 'tpv-tradeoff', 'absorber-efficiency']) {
    const c = page.locator(`canvas[data-plot="${slug}"]`);
    assert.equal(await c.count(), 1, slug);
    assert.ok(await c.getAttribute('data-frame'), `${slug} was drawn`);
  }
  // the blackbody at 1500 K with the band 1-3 um, as glowgap blackbody --json gives it
  const bb = cli(['blackbody', '--temp', '1500', '--band', '1-3', '--json']);
  assert.equal(await metric(page, 'bb-peak-um'), `${bb.peak_wavelength_um.toFixed(4)} µm`);
  assert.equal(await metric(page, 'bb-peak-ev'), `${bb.peak_energy_ev.toFixed(4)} eV`);
  assert.equal(number(await metric(page, 'bb-exitance')), Number(bb.exitance_w_m2.toExponential(6)));
  assert.equal(await metric(page, 'bb-band-fraction'), `${(bb.band_fraction * 100).toFixed(4)} %`);
  // the TPV pair at 2000 K and 0.75 eV, as glowgap tpv --json gives it
  const tpv = cli(['tpv', '--emitter-temp', '2000', '--gap', '0.75', '--json']);
  const t = Array.isArray(tpv) ? tpv[0] : tpv;
  assert.equal(await metric(page, 'tpv-efficiency'), `${(t.efficiency * 100).toFixed(2)} %`);
  assert.equal(await metric(page, 'tpv-power'), `${t.pmax_w_cm2.toFixed(4)} W/cm²`);
  assert.equal(await metric(page, 'tpv-voc'), `${t.voc_v.toFixed(4)} V`);
  console.log(`hot tab: blackbody 1500 K peak ${bb.peak_wavelength_um.toFixed(4)} um, band share ${(bb.band_fraction * 100).toFixed(4)} %; TPV 2000 K / 0.75 eV efficiency ${(t.efficiency * 100).toFixed(2)} %, ${t.pmax_w_cm2.toFixed(4)} W/cm2`);
  assert.match(await metric(page, 'abs-stagnation'), /^\d+\.\d K$/);
  assert.match(await page.locator('[data-note="abs-best"]').innerText(), /Best step absorber for this light: a step at \d+\.\d{4} µm at \d+\.\d K/);
  // cautions are visible in the TPV and solar-thermal cards
  for (const card of ['tpv', 'absorber']) {
    assert.ok(await page.locator(`[data-hot-card="${card}"] .safety`).isVisible(), `${card} caution`);
  }
  await page.screenshot({ path: artifact('hot-default.png'), fullPage: true });

  // the link reopens on the tab with the same figures
  const second = await hot(link);
  assert.equal(await second.page.locator('[data-panel="hot"]').getAttribute('aria-selected'), 'true');
  assert.equal(await metric(second.page, 'tpv-efficiency'), await metric(page, 'tpv-efficiency'));
  // and the other tabs are still there
  await act(second.page, () => second.page.locator('[data-panel="cell"]').click());
  assert.equal((await metric(second.page, 'efficiency')), '33.68 %');
  assert.deepEqual(page.errors, []);
  assert.deepEqual(second.page.errors, []);
  await second.context.close();
  await context.close();
});

test('edits change the figures and the link; a bad value names its control and keeps the figures', async () => {
  const { context, page } = await hot();
  const url0 = page.url();
  const eff0 = await metric(page, 'tpv-efficiency');

  // a grey emitter: the blackbody card also draws it, the efficiency changes
  const emitter = page.locator('[data-control="tpv-emitter"]');
  await act(page, () => emitter.fill('window:0.5-1.7,out=0.05'), 2);
  await page.waitForFunction((u) => location.href !== u, url0);
  const eff1 = await metric(page, 'tpv-efficiency');
  assert.notEqual(eff1, eff0);
  assert.match(await page.locator('[data-note="bb-emitter"]').innerText(), /TPV emitter \(window/);
  const url1 = page.url();

  // a view factor above 1: refused, said next to the field, the figures stay
  await page.locator('[data-control="tpv-view-factor"]').fill('1.5');
  const msg = page.locator('[data-error="tpv-view-factor"]');
  await page.waitForFunction(() => document.querySelector('[data-error="tpv-view-factor"]')?.textContent.length > 0);
  assert.match(await msg.innerText(), /view factor 1\.5 is out of range.*Still using 1\./);
  assert.equal(await metric(page, 'tpv-efficiency'), eff1, 'the figures survive');
  assert.equal(page.url(), url1, 'the link keeps the last good scenario');
  await page.screenshot({ path: artifact('hot-bad-input.png') });

  // an unreadable emitter text: its own message, the profile in use is kept
  await emitter.fill('window:0.5');
  assert.match(await page.locator('[data-error="tpv-emitter"]').innerText(), /L1-L2.*Still using window:0\.5-1\.7,out=0\.05/);
  assert.equal(await metric(page, 'tpv-efficiency'), eff1);

  // a stack in series: the table of subcells appears
  await act(page, () => page.locator('[data-control="tpv-gaps"]').fill('1.1, 0.7'));
  await page.locator('[data-table="tpv-subcells"]').waitFor();
  assert.equal(await page.locator('[data-table="tpv-subcells"] tbody tr').count(), 2);

  // linear axes and a band dragged over the blackbody plot
  await act(page, () => page.locator('[data-view="hot-axes-linear"]').click());
  const plot = page.locator('canvas[data-plot="blackbody-spectrum"]');
  await plot.scrollIntoViewIfNeeded();
  const frame = JSON.parse(await plot.getAttribute('data-frame'));
  const box = await plot.boundingBox();
  const y = box.y + (frame.top + frame.bottom) / 2;
  const xOf = (um) => box.x + frame.left + (um - frame.x[0]) / (frame.x[1] - frame.x[0]) * (frame.right - frame.left);
  await page.mouse.move(xOf(2), y);
  await page.mouse.down();
  await act(page, () => page.mouse.move(xOf(4), y));
  await page.mouse.up();
  const share = await metric(page, 'bb-band-fraction');
  const from = Number(await page.locator('[data-control="hot-band"]').inputValue());
  assert.ok(Math.abs(from - 2) < 0.05, `band from ${from}`);
  const bb = cli(['blackbody', '--temp', '1500', '--band', `${from}-${await page.locator('[data-control="hot-band-to"]').inputValue()}`, '--json']);
  assert.equal(share, `${(bb.band_fraction * 100).toFixed(4)} %`);

  // the absorber: the best design is taken with one click
  await act(page, () => page.locator('[data-action="abs-use-best"]').click());
  assert.equal(await page.locator('[data-control="abs-surface"]').inputValue(), 'step');
  // the link round-trips every edit
  const link = page.url();
  const again = await hot(link);
  for (const h of ['tpv-efficiency', 'bb-band-fraction', 'abs-work-efficiency']) {
    assert.equal(await metric(again.page, h), await metric(page, h), h);
  }
  assert.equal(await again.page.locator('[data-view="hot-axes-linear"]').getAttribute('aria-pressed'), 'true');
  await page.screenshot({ path: artifact('hot-edited.png'), fullPage: true });
  assert.deepEqual(page.errors, []);
  assert.deepEqual(again.page.errors, []);
  await again.context.close();
  await context.close();
});

test('dragging the blackbody and emitter temperature sliders redraws every step (time printed)', async () => {
  const { context, page } = await hot();
  const peak0 = await metric(page, 'bb-peak-um');
  const bbLat = await dragSlider(page, "hot-bb-temp-slider", 20, 1);
  assert.notEqual(await metric(page, 'bb-peak-um'), peak0);
  const eff0 = await metric(page, 'tpv-efficiency');
  const emLat = await dragSlider(page, "tpv-emitter-temp-slider", 20, 2);
  assert.notEqual(await metric(page, 'tpv-efficiency'), eff0);
  console.log(`hot sliders, edit to drawn: blackbody median ${median(bbLat).toFixed(1)} ms (max ${Math.max(...bbLat).toFixed(1)}), emitter median ${median(emLat).toFixed(1)} ms (max ${Math.max(...emLat).toFixed(1)}) (n=${bbLat.length}+${emLat.length})`);
  // the speed goal (median under 16 ms) is printed above, not asserted: these machines are
  // shared and noisy; every step must still have been drawn
  assert.ok(bbLat.length === 20 && emLat.length === 20 && [...bbLat, ...emLat].every(Number.isFinite));
  // the full trade-off comes back once the slider is let go
  await page.waitForTimeout(300);
  await page.locator('[data-card="tpv-tradeoff"]').scrollIntoViewIfNeeded();
  await page.screenshot({ path: artifact('hot-tpv.png') });
  await page.locator('[data-card="absorber-efficiency"]').scrollIntoViewIfNeeded();
  await page.screenshot({ path: artifact('hot-absorber.png') });
  assert.deepEqual(page.errors, []);
  await context.close();
});
