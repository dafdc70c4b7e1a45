// Real-browser tests of the radiator panel: headless Debian Chromium against the release
// build served on 127.0.0.1, figures checked against `glowgap eval LINK --radiator`.
// Run by .ci/test with the other browser tests.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import fs from 'node:fs';
import { useBrowser, rendered, figures, radiatorFigures, cliRadiatorFigures, artifact, renders } from './harness.mjs';

const env = useBrowser({ viewport: { width: 1400, height: 1000 }, acceptDownloads: true });
const fresh = (url) => env.fresh(url);


/** Do `fn` and wait until the page has rendered again. */
async function act(page, fn) {
  const n = await renders(page);
  await fn();
  await rendered(page, n + 1);
}

/** A fresh page on `url` with the radiator panel in front and computed. */
async function radiator(url) {
  const f = await fresh(url);
  const tab = f.page.locator('[data-panel="radiator"]');
  if ((await tab.getAttribute('aria-selected')) !== 'true') await act(f.page, () => tab.click());
  await f.page.waitForFunction(() => {
    const el = document.querySelector('[data-metric="net-power"]');
    return el && el.textContent.includes('W/m²');
  });
  return f;
}

/** The editor's control points in page coordinates, after scrolling it into view. */
async function handles(page) {
  const editor = page.locator('[data-control="emissivity-editor"]');
  await editor.scrollIntoViewIfNeeded();
  const box = await editor.boundingBox();
  const attr = await editor.getAttribute('data-handles');
  return attr.split(';').map((s) => s.split(',').map(Number)).map(([x, y]) => [box.x + x, box.y + y]);
}

/** A full-page screenshot with the settings column scrolled to its top. */
async function shot(page, name) {
  await page.evaluate(() => document.querySelectorAll('.panel').forEach((p) => { p.scrollTop = 0; }));
  await page.screenshot({ path: artifact(name), fullPage: true });
}

function median(xs) {
  const s = [...xs].sort((a, b) => a - b);
  return s[s.length >> 1];
}

test('the Radiator tab shows the default figures, as glowgap eval --radiator gives them, without console errors', async () => {
  const { context, page } = await fresh();
  const cellLink = page.url();
  await act(page, () => page.locator('[data-panel="radiator"]').click());
  await page.waitForFunction(() => document.querySelector('[data-metric="net-power"]')?.textContent.includes('W/m²'));
  assert.equal(await page.locator('[data-panel="radiator"]').getAttribute('aria-selected'), 'true');
  for (const hook of ['emissivity-editor', 'sky', 'ambient', 'hc']) {
    assert.equal(await page.locator(`[data-control="${hook}"]`).count(), 1, `control ${hook}`);
  }
  const shown = await radiatorFigures(page);
  const link = page.url();
  assert.notEqual(link, cellLink, 'the panel in front is part of the link');
  assert.deepEqual(shown, cliRadiatorFigures(link));
  // a blackbody at 300 K under the box sky, at night: sigma T^4 emitted
  assert.equal(shown.emitted, '459.30 W/m²');
  assert.match(shown['net-power'], /^\d+\.\d\d W\/m²$/);
  await shot(page, 'radiator-default.png');

  // the link opens on the radiator panel
  const second = await fresh(link);
  assert.equal(await second.page.locator('[data-panel="radiator"]').getAttribute('aria-selected'), 'true');
  assert.deepEqual(await radiatorFigures(second.page), shown);
  // and the cell panel is still there, unchanged
  await act(second.page, () => second.page.locator('[data-panel="cell"]').click());
  assert.equal((await figures(second.page)).efficiency, '33.68 %');
  assert.deepEqual(page.errors, []);
  assert.deepEqual(second.page.errors, []);
  await second.context.close();
  await context.close();
});

test('dragging a control point or stepping it by keys changes net power and the link; the link reopens identically', async () => {
  const { context, page } = await radiator();
  await act(page, () => page.locator('[data-preset="white-paint"]').click());
  assert.equal(await page.locator('[data-preset="white-paint"]').getAttribute('aria-pressed'), 'true');
  const before = await radiatorFigures(page);
  const url0 = page.url();

  // drag the 8 um point (the 11th) down, timing each step from the edit to the redraw
  const pts = await handles(page);
  assert.equal(pts.length, 15);
  const [hx, hy] = pts[10];
  await page.mouse.move(hx, hy);
  await act(page, () => page.mouse.down()); // chooses the point
  const lat = [];
  for (let i = 1; i <= 10; i++) {
    await page.evaluate(() => performance.clearMarks());
    await act(page, () => page.mouse.move(hx + i, hy + 8 * i));
    lat.push(await page.evaluate(() => {
      const a = performance.getEntriesByName('gg-edit').pop();
      const b = performance.getEntriesByName('gg-drawn').pop();
      return a && b ? b.startTime - a.startTime : NaN;
    }));
  }
  await act(page, () => page.mouse.up());
  console.log(`radiator point drag, edit to drawn: median ${median(lat).toFixed(1)} ms, max ${Math.max(...lat).toFixed(1)} ms (n=${lat.length})`);
  const dragged = await radiatorFigures(page);
  assert.notEqual(dragged['net-power'], before['net-power'], 'a drag changes the net power');
  assert.notEqual(page.url(), url0, 'and the link');
  assert.deepEqual(dragged, cliRadiatorFigures(page.url()));
  assert.equal(await page.locator('[data-preset="white-paint"]').getAttribute('aria-pressed'), 'false');

  // keys on the editor: raise the dragged point, then choose the last but one, add one
  // after it and remove it again
  const editor = page.locator('[data-control="emissivity-editor"]');
  await editor.focus();
  await act(page, () => page.keyboard.press('Shift+ArrowUp'));
  const keyed = await radiatorFigures(page);
  assert.notEqual(keyed['net-power'], dragged['net-power'], 'keys change the net power');
  await act(page, () => page.keyboard.press('End'));
  await act(page, () => page.keyboard.press('PageUp'));
  await act(page, () => page.keyboard.press('Insert'));
  assert.equal((await handles(page)).length, 16);
  assert.equal(await page.locator('.points-table tbody tr').count(), 16, 'the table follows');
  await editor.focus();
  await act(page, () => page.keyboard.press('Delete'));
  assert.equal((await handles(page)).length, 15);
  // double-click on empty plot adds a point
  const [ax, ay] = (await handles(page))[3];
  await act(page, () => page.mouse.dblclick(ax + 30, ay - 60));
  assert.equal((await handles(page)).length, 16);
  const edited = await radiatorFigures(page);
  const link = page.url();
  assert.deepEqual(edited, cliRadiatorFigures(link));
  await shot(page, 'radiator-edited.png');

  // a new context (no saved state) opened on the link shows the same
  const second = await fresh(link);
  assert.deepEqual(await radiatorFigures(second.page), edited);
  assert.equal((await handles(second.page)).length, 16);
  assert.equal(second.page.url(), link);
  assert.deepEqual(page.errors, []);
  assert.deepEqual(second.page.errors, []);
  await second.context.close();
  await context.close();
});

test('the points table edits a point; an out-of-order wavelength is refused with a message', async () => {
  const { context, page } = await radiator();
  await act(page, () => page.locator('[data-preset="polished-metal"]').click());
  const before = await radiatorFigures(page);
  await act(page, () => page.locator('[data-control="point-1-eps"]').fill('0.9'));
  const after = await radiatorFigures(page);
  assert.notEqual(after['solar-reflectance'], before['solar-reflectance']);
  assert.deepEqual(after, cliRadiatorFigures(page.url()));
  const url = page.url();
  await page.locator('[data-control="point-3-um"]').fill('0.2');
  const err = page.locator('[data-error="emissivity-points"]');
  await err.waitFor({ state: 'visible' });
  assert.match(await err.innerText(), /does not follow|order/);
  assert.deepEqual(await radiatorFigures(page), after, 'the previous profile stays in use');
  assert.equal(page.url(), url);
  assert.deepEqual(page.errors, []);
  await context.close();
});

test('sky, air and sun change the figures; bad input is refused next to its field and the figures stay', async () => {
  const { context, page } = await radiator();
  let prev = await radiatorFigures(page);
  const changes = async (what, fn) => {
    await act(page, fn);
    const now = await radiatorFigures(page);
    assert.notDeepEqual(now, prev, `${what} changes the figures`);
    assert.deepEqual(now, cliRadiatorFigures(page.url()), `${what}: page and command line agree`);
    prev = now;
  };
  await changes('space', () => page.selectOption('[data-control="sky"]', 'space'));
  assert.equal(prev['sky-emissivity'], '0.0000');
  await changes('clear sky', () => page.selectOption('[data-control="sky"]', 'clear'));
  await changes('precipitable water', () => page.locator('[data-control="pwv"]').fill('3'));
  // the same sky given by its dew point: 15 deg C is 2.80443 cm of water by Reitan's
  // relation (J. Appl. Meteor. 2, 776, 1963; coefficients from memory), shown in both fields
  await changes('dew point', () => page.locator('[data-control="dew"]').fill('15'));
  assert.equal(await page.locator('[data-control="pwv"]').inputValue(), '2.80443');
  await changes('ambient', () => page.locator('[data-control="ambient"]').fill('290'));
  await changes('h_c', () => page.locator('[data-control="hc"]').fill('6'));
  await changes('sun', () => page.locator('[data-control="sun"]').check());
  await changes('irradiance scale', () => page.locator('[data-control="sun-scale"]').fill('0.8'));
  // a Lambertian surface absorbs alike from every direction: the zenith angle is taken and
  // leaves the figures as they were
  await act(page, () => page.locator('[data-control="sun-zenith"]').fill('40'));
  assert.deepEqual(await radiatorFigures(page), prev);
  assert.deepEqual(cliRadiatorFigures(page.url()), prev);

  const url = page.url();
  const bad = async (hook, text, pattern) => {
    await page.locator(`[data-control="${hook}"]`).fill(text);
    const err = page.locator(`[data-error="${hook}"]`);
    await err.waitFor({ state: 'visible' });
    assert.match(await err.innerText(), pattern, `${hook} '${text}'`);
    assert.equal(await page.locator(`[data-control="${hook}"]`).getAttribute('aria-invalid'), 'true');
    assert.deepEqual(await radiatorFigures(page), prev, `${hook} '${text}' keeps the figures`);
    assert.equal(page.url(), url, `${hook} '${text}' keeps the link`);
  };
  await bad('ambient', '-5', /out of range.*Still using 290 K/s);
  await bad('ambient', 'NaN', /not a number.*Still using 290 K/s);
  await bad('ambient', 'warm', /not a number/);
  await bad('hc', '-1', /out of range/);
  await bad('pwv', '', /Type a value/);
  await bad('dew', '288', /not in K/);
  await bad('sun-zenith', '95', /out of range/);
  await page.screenshot({ path: artifact('radiator-bad-input.png') });
  // a good value clears the message
  await changes('ambient again', () => page.locator('[data-control="ambient"]').fill('295'));
  assert.equal(await page.locator('[data-error="ambient"]').innerText(), '');
  assert.deepEqual(page.errors, []);
  await context.close();
});

test('a broken emissivity file shows its error with the line; a good one becomes the profile', async () => {
  const { context, page } = await radiator();
  const before = await radiatorFigures(page);
  const input = page.locator('[data-control="emissivity-file"]');
  await input.setInputFiles({
    name: 'broken.csv',
    mimeType: 'text/csv',
    buffer: Buffer.from('wavelength_um,emissivity\n0.3,0.1\n8,abc\n13,0.9\n'),
  });
  const err = page.locator('[data-error="emissivity-file"]');
  await err.waitFor({ state: 'visible' });
  assert.match(await err.innerText(), /line 3/);
  assert.deepEqual(await radiatorFigures(page), before, 'the previous profile stays in use');

  await act(page, () => input.setInputFiles({
    name: 'coating.csv',
    mimeType: 'text/csv',
    buffer: Buffer.from('wavelength_um,emissivity\n0.3,0.1\n2.5,0.1\n8,0.95\n13,0.95\n50,0.3\n'),
  }));
  const after = await radiatorFigures(page);
  assert.notDeepEqual(after, before);
  assert.equal(await err.innerText(), '', 'the message is gone');
  assert.equal(await page.locator('[data-preset="measured"]').getAttribute('aria-pressed'), 'true');
  assert.deepEqual(after, cliRadiatorFigures(page.url()));
  // a reflectance file is read as 1 - R
  await act(page, () => input.setInputFiles({
    name: 'mirror.csv',
    mimeType: 'text/csv',
    buffer: Buffer.from('wavelength_nm,reflectance\n300,0.9\n50000,0.9\n'),
  }));
  assert.equal((await radiatorFigures(page))['thermal-emittance'], '0.1000');
  // the measured profile is kept while a preset is in use
  await act(page, () => page.locator('[data-preset="blackbody"]').click());
  await act(page, () => page.locator('[data-preset="measured"]').click());
  assert.equal((await radiatorFigures(page))['thermal-emittance'], '0.1000');
  assert.deepEqual(page.errors, []);
  await context.close();
});

test('the radiator plots download as SVG, PNG and CSV', async () => {
  const { context, page } = await radiator();
  await act(page, () => page.locator('[data-preset="window"]').click());
  for (const slug of ['emissivity', 'balance', 'net-curve']) {
    for (const ext of ['svg', 'png', 'csv']) {
      const [download] = await Promise.all([
        page.waitForEvent('download'),
        page.locator(`[data-action="download-${slug}-${ext}"]`).click(),
      ]);
      assert.equal(download.suggestedFilename(), `glowgap-${slug}.${ext}`);
      const file = artifact(`radiator-export-${slug}.${ext}`);
      await download.saveAs(file);
      const bytes = fs.readFileSync(file);
      assert.ok(bytes.length > 200, `${slug}.${ext} has content`);
      if (ext === 'csv') assert.match(bytes.toString(), /^# Glowgap: /);
      if (ext === 'svg') assert.match(bytes.toString(), /<svg/);
    }
  }
  const csv = fs.readFileSync(artifact('radiator-export-emissivity.csv'), 'utf8');
  assert.match(csv, /\nwavelength_um,emissivity,sky_transmittance,sun_W_m2_um,blackbody_W_m2_um\n/);
  assert.deepEqual(page.errors, []);
  await context.close();
});
