// Real-browser tests of the Solar cell tab's absorptance section and loss chart: headless
// Chromium against the release build served on 127.0.0.1, the figures checked against
// `glowgap eval LINK` (the command line shows the cell with its absorptance). Run by .ci/test.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { useBrowser, rendered, artifact, figures, cliFigures, edit } from './harness.mjs';

const env = useBrowser();
const fresh = (url) => env.fresh(url);


/** The Solar cell tab is in front on a fresh page; wait for its figures. */
async function cellShown(page) {
  await page.waitForFunction(() => /%$/.test(document.querySelector('[data-metric="efficiency"]')?.textContent || ''), null, { timeout: 20000 });
}

/** Open `link` in a new context (no saved state): the same figures, then `check(page)`. */
async function reopened(link, shown, check) {
  const { context, page } = await fresh(link);
  await cellShown(page);
  assert.deepEqual(await figures(page), shown);
  await check(page);
  assert.deepEqual(page.errors, []);
  await context.close();
}


test('the loss chart sits in the Solar cell tab and follows the band gap', async () => {
  const { context, page } = await fresh();
  await cellShown(page);
  await page.locator('[data-card="losses"]').waitFor({ state: 'visible' });
  await page.locator('[data-plot="losses"]').waitFor({ state: 'visible' });
  assert.equal(await page.locator('[data-panel="cell"]').getAttribute('aria-selected'), 'true');
  const delivered = () => page.locator('[data-card="losses"] [data-loss="delivered"]').innerText();
  // the delivered share of the incident power is the efficiency (energy conservation: the
  // parts add up to the input; definition of efficiency), to the legend's 0.1 %
  const check = async () => {
    const eff = parseFloat(await page.locator('[data-metric="efficiency"]').innerText());
    const share = parseFloat((await delivered()).replace(/^delivered\s*/, ''));
    assert.ok(Math.abs(share - eff) <= 0.051, `delivered ${share} % vs efficiency ${eff} %`);
  };
  await check();
  const before = await delivered();
  await edit(page, () => page.locator('[data-control="gap"]').fill('1.1'));
  await page.waitForFunction((b) => document.querySelector('[data-card="losses"] [data-loss="delivered"]').textContent !== b, before);
  await check();
  assert.deepEqual(page.errors, []);
  await context.close();
});

test('an EQE file gives its Jsc and Voc limits next to the ideal step; a bad file is refused beside its button', async () => {
  const { context, page } = await fresh();
  await cellShown(page);
  const input = page.locator('[data-control="eqe-file"]');
  await input.setInputFiles({ name: 'broken.csv', mimeType: 'text/csv', buffer: Buffer.from('wavelength_nm,eqe_percent\n400,50\n500,abc\n') });
  const err = page.locator('[data-error="eqe-file"]');
  await err.waitFor({ state: 'visible' });
  assert.match(await err.innerText(), /line 3/i);

  // a flat 90 % EQE from 300 to 800 nm, falling to 0 at 850 nm
  const rows = ['wavelength_nm,eqe_percent'];
  for (let nm = 300; nm <= 800; nm += 10) rows.push(`${nm},90`);
  rows.push('825,45', '850,0');
  await edit(page, () => input.setInputFiles({ name: 'flat.csv', mimeType: 'text/csv', buffer: Buffer.from(rows.join('\n') + '\n') }));
  const cell = page.locator('[data-metric="eqe-jsc"]');
  await cell.waitFor();
  assert.equal(await err.isVisible(), false);
  // glowgap eval LINK shows the cell with this absorptance: the same Jsc, Voc and efficiency
  const cli = cliFigures(page.url());
  assert.equal(await cell.innerText(), cli.jsc);
  assert.equal(await page.locator('[data-metric="eqe-voc"]').innerText(), cli.voc);
  assert.equal(await page.locator('[data-metric="eqe-efficiency"]').innerText(), cli.efficiency);
  // 90 % of the light collected: less current than the ideal step at the same edge
  assert.ok(parseFloat(await cell.innerText()) < parseFloat(await page.locator('[data-metric="eqe-jsc-step"]').innerText()));
  await page.locator('[data-plot="eqe"]').waitFor({ state: 'visible' });
  assert.deepEqual(page.errors, []);
  await context.close();
});

test('an Urbach tail: its Jsc and Voc limits next to the ideal step, checked range, carried by the link', async () => {
  const { context, page } = await fresh();
  await cellShown(page);
  await edit(page, () => page.locator('[data-control="absorber-urbach"]').check());
  const field = page.locator('[data-control="urbach"]');
  await field.waitFor({ state: 'visible' });
  assert.equal(await field.inputValue(), '15');
  const jsc = page.locator('[data-metric="eqe-jsc"]');
  await jsc.waitFor();
  assert.match(await page.locator('[data-info="eqe-name"]').innerText(), /Urbach tail of 15 meV below the 1\.340 eV gap/);
  // glowgap eval LINK shows the cell with this absorptance: the same Jsc, Voc and efficiency
  let cli = cliFigures(page.url());
  assert.equal(await jsc.innerText(), cli.jsc);
  assert.equal(await page.locator('[data-metric="eqe-voc"]').innerText(), cli.voc);
  assert.equal(await page.locator('[data-metric="eqe-efficiency"]').innerText(), cli.efficiency);
  // Urbach, Phys. Rev. 92, 1324 (1953): a(E) = exp((E - Eg)/Eu) below the gap, full above, so
  // the tail absorbs everything the step does and more (Jsc above the step's); by reciprocity
  // (Rau, Phys. Rev. B 76, 085303, 2007) it also emits more, so its radiative Voc is lower
  const num = async (hook) => parseFloat(await page.locator(`[data-metric="${hook}"]`).innerText());
  assert.ok((await num('eqe-jsc')) > (await num('eqe-jsc-step')), 'tail Jsc above the step');
  assert.ok((await num('eqe-voc-rad')) < (await num('eqe-voc-rad-step')), 'tail Voc below the step');
  const at15 = await jsc.innerText();

  // bad input: the scenario's range and units, how to fix it; the tail in use stays
  const err = page.locator('[data-error="urbach"]');
  await field.fill('500');
  await err.waitFor({ state: 'visible' });
  assert.match(await err.innerText(), /Urbach energy 500 meV is out of range; give a value from 0\.1 to 200 meV.*Still using 15 meV/);
  await field.fill('wide');
  await page.waitForFunction(() => /not an Urbach energy/.test(document.querySelector('[data-error="urbach"]').textContent));
  assert.equal(await jsc.innerText(), at15);

  // a wider tail absorbs more still
  await edit(page, () => field.fill('25'));
  await page.waitForFunction((j) => document.querySelector('[data-metric="eqe-jsc"]').textContent !== j, at15);
  assert.ok(parseFloat(await jsc.innerText()) > parseFloat(at15));
  cli = cliFigures(page.url());
  assert.equal(await jsc.innerText(), cli.jsc);
  await page.locator('[data-plot="eqe"]').waitFor({ state: 'visible' });
  await page.locator('.eqe-section').scrollIntoViewIfNeeded();
  await page.locator('.eqe-section').screenshot({ path: artifact('cell-urbach.png') });

  const link = page.url();
  const figs = await figures(page);
  await reopened(link, figs, async (p) => {
    assert.equal(await p.locator('[data-control="absorber-urbach"]').isChecked(), true);
    assert.equal(await p.locator('[data-control="urbach"]').inputValue(), '25');
    assert.equal(await p.locator('[data-metric="eqe-jsc"]').innerText(), cli.jsc);
  });

  // back to the ideal step: no comparison; the tail's width is offered again
  await edit(page, () => page.locator('[data-control="absorber-step"]').check());
  await page.waitForFunction(() => !document.querySelector('[data-metric="eqe-jsc"]'));
  await edit(page, () => page.locator('[data-control="absorber-urbach"]').check());
  assert.equal(await field.inputValue(), '25');
  // a measured EQE needs a file first
  await page.locator('[data-control="absorber-measured"]').click();
  await page.locator('[data-error="absorber"]').waitFor({ state: 'visible' });
  assert.match(await page.locator('[data-error="absorber"]').innerText(), /Load an EQE file first/);
  assert.equal(await page.locator('[data-control="absorber-urbach"]').isChecked(), true);
  assert.deepEqual(page.errors, []);
  await context.close();
});

