// Real-browser tests of the Stack panel: headless Chromium against the release build served
// on 127.0.0.1, its figures checked against `glowgap eval LINK --stack`. Run by .ci/test.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import fs from 'node:fs';
import path from 'node:path';
import { execFileSync } from 'node:child_process';
import { useBrowser, rendered, artifact, stackFigures, cliStackFigures, cliFigures, plotFrame, CLI, renders, edit } from './harness.mjs';

const env = useBrowser();
const fresh = (url) => env.fresh(url);


/** Wait until the stack's figures are on the page. */
async function stackShown(page) {
  await page.waitForFunction(() => /%$/.test(document.querySelector('[data-metric="stack-efficiency"]')?.textContent || ''), null, { timeout: 20000 });
}

/** Wait until the two-junction map has been computed. */
async function mapReady(page) {
  await page.waitForFunction(() => /stacks in/.test(document.querySelector('[data-info="map-timing"]')?.textContent || ''), null, { timeout: 20000 });
}

/** Open the Stack tab from the tab bar. */
async function openStack(page) {
  const n0 = await renders(page);
  await page.locator('[data-panel="stack"]').click();
  await rendered(page, n0 + 1);
  await stackShown(page);
}

/** Open `link` in a new context (no saved state): the same figures, then `check(page)`. */
async function reopened(link, figures, check) {
  const { context, page } = await fresh(link);
  await stackShown(page);
  assert.deepEqual(await stackFigures(page), figures);
  await check(page);
  assert.deepEqual(page.errors, []);
  await context.close();
}


test('the Stack tab shows the figures of glowgap eval --stack, from the tab bar and from a link', async () => {
  const { context, page } = await fresh();
  await openStack(page);
  const shown = await stackFigures(page);
  const link = page.url();
  assert.deepEqual(shown, cliStackFigures(link));
  // the default design: a 1.7/1.1 eV series tandem under AM1.5G (glowgap stack --gaps 1.7,1.1)
  assert.equal(shown['stack-efficiency'], '44.36 %');
  await mapReady(page);
  await page.screenshot({ path: artifact('stack-default.png'), fullPage: true });
  assert.deepEqual(page.errors, []);

  // the link holds the panel: a new page opens straight on the stack
  await reopened(link, shown, async (p) => {
    assert.equal(await p.locator('[data-panel="stack"]').getAttribute('aria-selected'), 'true');
  });
  await context.close();
});

test('the editor: add a junction, change the connection, step gap 1 with the keys; the link reopens identically', async () => {
  const { context, page } = await fresh();
  await openStack(page);
  const start = await stackFigures(page);

  await edit(page, () => page.locator('[data-control="junctions"]').selectOption('3'));
  await page.locator('[data-control="gap-3"]').waitFor();
  const three = await stackFigures(page);
  assert.notDeepEqual(three, start, 'a third junction changes the figures');
  assert.deepEqual(three, cliStackFigures(page.url()));

  await edit(page, () => page.locator('[data-control="connection"]').selectOption('independent'));
  const independent = await stackFigures(page);
  assert.notDeepEqual(independent, three);
  assert.deepEqual(independent, cliStackFigures(page.url()));
  // independent subcells at their own maximum power points do at least as well as in series
  assert.ok(parseFloat(independent['stack-efficiency']) >= parseFloat(three['stack-efficiency']));

  const gap1 = page.locator('[data-control="gap-1"]');
  const g0 = parseFloat(await gap1.inputValue());
  await gap1.focus();
  await edit(page, () => page.keyboard.press('ArrowUp'));
  assert.ok(Math.abs(parseFloat(await gap1.inputValue()) - (g0 + 0.001)) < 1e-9, 'ArrowUp: +1 meV');
  await edit(page, () => page.keyboard.press('Shift+ArrowUp'));
  assert.ok(Math.abs(parseFloat(await gap1.inputValue()) - (g0 + 0.011)) < 1e-9, 'Shift+ArrowUp: +10 meV');
  const stepped = await stackFigures(page);
  assert.notDeepEqual(stepped, independent);
  const link = page.url();
  assert.deepEqual(stepped, cliStackFigures(link));

  // a gap that breaks the order is refused next to its field; the design stays
  await gap1.fill('0.7');
  const err = page.locator('[data-error="gap-1"]');
  await err.waitFor({ state: 'visible' });
  assert.match(await err.innerText(), /band gap 1 .* not above band gap 2/i);
  assert.deepEqual(await stackFigures(page), stepped);
  assert.equal(page.url(), link);

  // a new context (no saved state) on that link shows the same design and figures
  await reopened(link, stepped, async (p) => {
    assert.equal(await p.locator('[data-control="junctions"]').inputValue(), '3');
    assert.equal(await p.locator('[data-control="connection"]').inputValue(), 'independent');
    assert.ok(Math.abs(parseFloat(await p.locator('[data-control="gap-1"]').inputValue()) - (g0 + 0.011)) < 1e-9);
  });
  assert.deepEqual(page.errors, []);
  await context.close();
});

test('a click on the map moves the design to the clicked gaps', async () => {
  const { context, page } = await fresh();
  await openStack(page);
  await mapReady(page);
  const map = page.locator('[data-plot="tandem-map"]');
  await map.scrollIntoViewIfNeeded();
  const f = await plotFrame(page, 'tandem-map');
  const box = await map.boundingBox();
  const [bottom, top] = [1.0, 1.8];
  const x = f.left + ((bottom - f.x[0]) / (f.x[1] - f.x[0])) * (f.right - f.left);
  const y = f.bottom - ((top - f.y[0]) / (f.y[1] - f.y[0])) * (f.bottom - f.top);
  const before = await stackFigures(page);
  await edit(page, () => page.mouse.click(box.x + x, box.y + y));
  const g1 = parseFloat(await page.locator('[data-control="gap-1"]').inputValue());
  const g2 = parseFloat(await page.locator('[data-control="gap-2"]').inputValue());
  // one CSS pixel is about 2 meV on this map
  assert.ok(Math.abs(g1 - top) <= 0.004, `top gap ${g1}`);
  assert.ok(Math.abs(g2 - bottom) <= 0.004, `bottom gap ${g2}`);
  const after = await stackFigures(page);
  assert.notDeepEqual(after, before);
  assert.deepEqual(after, cliStackFigures(page.url()));
  await page.locator('[data-card="tandem-map"]').screenshot({ path: artifact('stack-map.png') });
  assert.deepEqual(page.errors, []);
  await context.close();
});

/** Record what the search's progress line shows while it runs. */
async function watchProgress(page) {
  await page.evaluate(() => {
    window.__seen = [];
    const el = document.querySelector('[data-progress="optimize"]');
    new MutationObserver(() => {
      if (!el.hidden) window.__seen.push(el.textContent);
    }).observe(el, { subtree: true, childList: true, characterData: true, attributes: true });
  });
}

test('optimize runs in the background with progress, ends no worse than the design, and can be cancelled', async () => {
  const { context, page } = await fresh();
  await openStack(page);
  const before = parseFloat((await stackFigures(page))['stack-efficiency']);
  await watchProgress(page);
  await page.locator('[data-action="optimize"]').click();
  const result = page.locator('[data-info="optimize"]');
  await result.waitFor({ state: 'visible', timeout: 30000 });
  assert.match(await result.innerText(), /Best 2-junction series stack/);
  await page.waitForFunction((b) => parseFloat(document.querySelector('[data-metric="stack-efficiency"]').textContent) >= b, before);
  const best = await stackFigures(page);
  assert.ok(parseFloat(best['stack-efficiency']) >= before, `${best['stack-efficiency']} vs ${before}`);
  // glowgap optimize --junctions 2: 45.73 % at 1.633 / 0.960 eV
  assert.equal(best['stack-efficiency'], '45.73 %');
  assert.deepEqual(best, cliStackFigures(page.url()));
  assert.ok((await page.evaluate(() => window.__seen)).length > 0, 'the progress line was shown');

  // six junctions take long enough to watch the count and to cancel
  await edit(page, () => page.locator('[data-control="junctions"]').selectOption('6'));
  const six = await stackFigures(page);
  const link = page.url();
  // the whole search can take well under a second, so the cancel is pressed inside the page
  // the moment the first count shows (a round trip from the test could arrive after the end)
  const counted = await page.evaluate(
    () =>
      new Promise((resolve) => {
        const el = document.querySelector('[data-progress="optimize"]');
        const seen = new MutationObserver(() => {
          if (!el.hidden && /stacks evaluated/.test(el.textContent)) {
            seen.disconnect();
            document.querySelector('[data-action="cancel-optimize"]').click();
            resolve(el.textContent);
          }
        });
        seen.observe(el, { subtree: true, childList: true, characterData: true, attributes: true });
        document.querySelector('[data-action="optimize"]').click();
      }),
  );
  assert.match(counted, /stacks evaluated/);
  await result.waitFor({ state: 'visible' });
  assert.match(await result.innerText(), /cancelled/i);
  assert.equal(await page.locator('[data-progress="optimize"]').isVisible(), false);
  await page.waitForTimeout(1500);
  assert.deepEqual(await stackFigures(page), six, 'a cancelled search leaves the design alone');
  assert.equal(page.url(), link);

  // and run to the end it beats the design
  await page.locator('[data-action="optimize"]').click();
  await page.waitForFunction(() => /Best 6-junction/.test(document.querySelector('[data-info="optimize"]')?.textContent || ''), null, { timeout: 60000 });
  await page.waitForFunction((u) => location.href !== u, link);
  const best6 = await stackFigures(page);
  assert.ok(parseFloat(best6['stack-efficiency']) >= parseFloat(six['stack-efficiency']));
  assert.deepEqual(best6, cliStackFigures(page.url()));

  // a range that cannot be searched is said under the button, which waits for a good one
  await page.locator('[data-control="search-to"]').fill('0.1');
  await page.locator('[data-error="optimize"]').waitFor({ state: 'visible' });
  assert.match(await page.locator('[data-error="optimize"]').innerText(), /search range .* lower first/);
  assert.equal(await page.locator('[data-action="optimize"]').isDisabled(), true);
  await page.locator('[data-control="search-to"]').fill('4.5');
  await page.waitForFunction(() => !document.querySelector('[data-action="optimize"]').disabled);
  assert.deepEqual(page.errors, []);
  await context.close();
});

/** The CSS-px position on the page of (bottom, top) gaps [eV] on the map. */
async function mapPoint(page, bottom, top) {
  const map = page.locator('[data-plot="tandem-map"]');
  await map.scrollIntoViewIfNeeded();
  const f = await plotFrame(page, 'tandem-map');
  const box = await map.boundingBox();
  return {
    x: box.x + f.left + ((bottom - f.x[0]) / (f.x[1] - f.x[0])) * (f.right - f.left),
    y: box.y + f.bottom - ((top - f.y[0]) / (f.y[1] - f.y[0])) * (f.bottom - f.top),
  };
}

test('holding one gap fixed: checked with a message that says how to fix it, kept by the search, carried by the link', async () => {
  const { context, page } = await fresh();
  await openStack(page);
  const choice = page.locator('[data-control="fix-at"]');
  const field = page.locator('[data-control="fix-gap"]');
  const err = page.locator('[data-error="fix-gap"]');
  assert.equal(await choice.inputValue(), 'off');
  assert.equal(await field.isVisible(), false);

  // keyboard: focus the choice and step to "the bottom cell" with an arrow key
  await choice.focus();
  await edit(page, () => page.keyboard.press('ArrowDown'));
  assert.equal(await choice.inputValue(), 'bottom');
  await field.waitFor({ state: 'visible' });
  assert.equal(parseFloat(await field.inputValue()), 1.12);
  assert.match(await page.locator('.search-section .hint').first().innerText(), /bottom cell held at 1\.12 eV/);

  // bad input: said under the field, how to fix it, and the last good value stays
  const link = page.url();
  await field.fill('abc');
  await err.waitFor({ state: 'visible' });
  assert.match(await err.innerText(), /not a band gap; type e\.g\. 1\.34.*Still using 1\.120 eV/);
  await field.fill('30');
  await page.waitForFunction(() => /out of range/.test(document.querySelector('[data-error="fix-gap"]').textContent));
  assert.match(await err.innerText(), /fixed gap 30 eV is out of range; give a band gap from .* eV .*Still using 1\.120 eV/);
  await field.fill('4.7');
  await page.waitForFunction(() => /no room/.test(document.querySelector('[data-error="fix-gap"]').textContent));
  assert.match(await err.innerText(), /widen the range or move the fixed gap/);
  assert.equal(page.url(), link, 'refused values do not reach the link');
  await field.fill('1.12');
  await page.waitForFunction(() => !document.querySelector('[data-error="fix-gap"]').textContent);
  await page.locator('[data-card="tandem-map"]').scrollIntoViewIfNeeded();
  await page.locator('.search-section').screenshot({ path: artifact('stack-fixed-gap.png') });

  // the search holds the bottom cell at 1.12 eV and finds its best partner
  await page.locator('[data-action="optimize"]').click();
  const result = page.locator('[data-info="optimize"]');
  await result.waitFor({ state: 'visible', timeout: 30000 });
  assert.match(await result.innerText(), /Best 2-junction series stack with the bottom cell held at 1\.12 eV/);
  await page.waitForFunction(() => parseFloat(document.querySelector('[data-control="gap-2"]').value) === 1.12
    && parseFloat(document.querySelector('[data-control="gap-1"]').value) !== 1.7);
  const top = parseFloat(await page.locator('[data-control="gap-1"]').inputValue());
  // commonly cited for perovskite-on-silicon two-terminal tandems (AM1.5G, radiative limit):
  // best top gap about 1.73 eV with a 1.12 eV bottom cell (tolerance 0.03 eV, 3 digits quoted)
  assert.ok(Math.abs(top - 1.73) < 0.03, `top gap ${top}`);
  const shown = await stackFigures(page);
  assert.deepEqual(shown, cliStackFigures(page.url()));
  // glowgap optimize holds the same gap and finds the same limit (the page also starts from
  // the design, so it can only be as good or better, to the 2 decimals shown)
  const cli = JSON.parse(execFileSync(CLI, ['optimize', '--junctions', '2', '--fix', '1.12', '--fix-at', 'bottom', '--json'], { encoding: 'utf8' }));
  assert.equal(cli.gaps_ev[1], 1.12);
  assert.ok(parseFloat(shown['stack-efficiency']) >= Math.round(cli.efficiency * 1e4) / 100 - 0.005, `${shown['stack-efficiency']} vs ${cli.efficiency}`);
  await page.locator('.search-section').screenshot({ path: artifact('stack-fixed-result.png') });

  // the link holds the fixed gap; a new page shows the same choice
  await reopened(page.url(), shown, async (p) => {
    assert.equal(await p.locator('[data-control="fix-at"]').inputValue(), 'bottom');
    assert.equal(parseFloat(await p.locator('[data-control="fix-gap"]').inputValue()), 1.12);
  });
  // and turning it off frees every gap again
  await edit(page, () => choice.selectOption('off'));
  assert.equal(await field.isVisible(), false);
  assert.doesNotMatch(await page.locator('.search-section .hint').first().innerText(), /held at/);
  assert.deepEqual(page.errors, []);
  await context.close();
});

test('the map refines its best grid points to the optimum, labels both, and a click or a key on the optimum takes it', async () => {
  const { context, page } = await fresh();
  await openStack(page);
  await mapReady(page);
  const optimum = page.locator('[data-info="map-optimum"]');
  await page.waitForFunction(() => /refined from the grid: top/.test(document.querySelector('[data-info="map-optimum"]')?.textContent || ''), null, { timeout: 20000 });
  const text = await optimum.innerText();
  const m = text.match(/top ([\d.]+) eV, bottom ([\d.]+) eV, ([\d.]+) %/);
  assert.ok(m, text);
  const [top, bottom, eff] = m.slice(1).map(Number);
  // tests/fixtures/stack_optimum.csv: scipy Nelder-Mead on the same model, AM1.5G series.
  // Gaps to 1e-3 eV (the AM1.5G surface has kinks at table points), efficiency to the last
  // digit shown (0.001 %).
  const row = fs.readFileSync(path.resolve(import.meta.dirname, '../fixtures/stack_optimum.csv'), 'utf8')
    .split('\n').find((l) => l.startsWith('am1.5g,series,')).split(',').map(Number);
  assert.ok(Math.abs(top - row[2]) < 1e-3 && Math.abs(bottom - row[3]) < 1e-3, text);
  assert.ok(Math.abs(eff - row[4] * 100) <= 0.0006, text);
  // the grid's best is listed beside it, no better than the refined optimum
  const best = (await page.locator('[data-info="map-best"]').innerText()).match(/([\d.]+) %/);
  assert.ok(parseFloat(best[1]) <= eff + 0.005, `${best[1]} vs ${eff}`);

  // hovering the optimum's star says which marker it is
  const at = await mapPoint(page, bottom, top);
  await page.mouse.move(at.x, at.y);
  const tip = page.locator('[data-card="tandem-map"] .tooltip');
  await tip.waitFor({ state: 'visible' });
  assert.match(await tip.innerText(), /optimum: top [\d.]+ eV · bottom [\d.]+ eV[\s\S]*refined from the grid's best points/);
  await page.locator('[data-card="tandem-map"]').screenshot({ path: artifact('stack-map-optimum.png') });
  // away from the markers it reads the grid
  const away = await mapPoint(page, 0.7, 2.2);
  await page.mouse.move(away.x, away.y);
  await page.waitForFunction(() => !/optimum/.test(document.querySelector('[data-card="tandem-map"] .tooltip')?.textContent || 'optimum'));

  // a click on the star puts the design on the optimum (to 0.1 meV)
  await edit(page, () => page.mouse.click(at.x, at.y));
  const g1 = parseFloat(await page.locator('[data-control="gap-1"]').inputValue());
  const g2 = parseFloat(await page.locator('[data-control="gap-2"]').inputValue());
  assert.ok(Math.abs(g1 - top) <= 1e-4 && Math.abs(g2 - bottom) <= 1e-4, `${g1} / ${g2}`);
  assert.deepEqual(await stackFigures(page), cliStackFigures(page.url()));
  // a gap edit leaves the map (and its refined optimum) as it was
  assert.equal(await optimum.innerText(), text);
  await page.mouse.move(away.x, away.y);
  await page.locator('[data-card="tandem-map"]').screenshot({ path: artifact('stack-map-design-on-optimum.png') });
  // and from the keyboard: the legend's button does the same
  await edit(page, () => page.locator('[data-control="gap-1"]').fill('1.75'));
  await page.locator('[data-action="use-optimum"]').focus();
  await edit(page, () => page.keyboard.press('Enter'));
  assert.equal(parseFloat(await page.locator('[data-control="gap-1"]').inputValue()), g1);
  assert.equal(parseFloat(await page.locator('[data-control="gap-2"]').inputValue()), g2);
  assert.deepEqual(page.errors, []);
  await context.close();
});
