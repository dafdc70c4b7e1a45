// Browser benchmark (numbers printed, nothing asserted): latency from a gap edit to all
// plots redrawn, first render after load, the 3-junction gap search and the 201 x 201
// two-junction map in the Stack tab, and the gzipped transfer size of the app.
// Run: node tests/browser/bench.mjs (after trunk build --release).
import fs from 'node:fs';
import path from 'node:path';
import { serve, launch, newPage, rendered, DIST } from './harness.mjs';
import { firstVisit, BUDGET_KB } from './size.mjs';

function pct(sorted, p) {
  return sorted[Math.min(sorted.length - 1, Math.floor(p * sorted.length))];
}

const server = await serve(0);
const browser = await launch();

// a fresh page of the app with the Stack tab in front
async function openStack() {
  const context = await browser.newContext({ viewport: { width: 1400, height: 1000 } });
  const page = await newPage(context);
  await page.goto(server.url);
  await rendered(page);
  const n = Number(await page.evaluate(() => document.body.dataset.renders));
  await page.locator('[data-panel="stack"]').click();
  await rendered(page, n + 1);
  return { context, page };
}
try {
  // first render after load, over 5 cold loads (fresh contexts, no cache)
  const loads = [];
  for (let i = 0; i < 5; i++) {
    const context = await browser.newContext({ viewport: { width: 1400, height: 1000 } });
    const page = await newPage(context);
    await page.goto(server.url);
    await rendered(page);
    loads.push(await page.evaluate(() => {
      const m = performance.getEntriesByName('gg-drawn')[0];
      return m ? m.startTime : performance.now();
    }));
    await context.close();
  }
  loads.sort((a, b) => a - b);
  console.log(`browser first_render_ms median=${pct(loads, 0.5).toFixed(1)} max=${loads[loads.length - 1].toFixed(1)} (goal < 1000)`);

  // gap edits: 60 arrow-key steps, each timed from gg-edit to gg-drawn
  const context = await browser.newContext({ viewport: { width: 1400, height: 1000 } });
  const page = await newPage(context);
  await page.goto(server.url);
  await rendered(page);
  await page.locator('[data-control="gap"]').first().focus();
  const lat = [];
  for (let i = 0; i < 60; i++) {
    const n = Number(await page.evaluate(() => document.body.dataset.renders));
    await page.evaluate(() => performance.clearMarks());
    await page.keyboard.press(i % 2 ? 'ArrowDown' : 'ArrowUp');
    await rendered(page, n + 1);
    const d = await page.evaluate(() => {
      const a = performance.getEntriesByName('gg-edit').pop();
      const b = performance.getEntriesByName('gg-drawn').pop();
      return a && b ? b.startTime - a.startTime : NaN;
    });
    if (Number.isFinite(d)) lat.push(d);
  }
  lat.sort((a, b) => a - b);
  if (lat.length) {
    console.log(`browser gap_edit_to_drawn_ms median=${pct(lat, 0.5).toFixed(2)} p95=${pct(lat, 0.95).toFixed(2)} n=${lat.length} (goals: median < 16, p95 < 33)`);
  } else {
    console.log('browser gap_edit_to_drawn_ms unavailable (no gg-edit/gg-drawn marks)');
  }
  await context.close();

  // the 3-junction series gap search on AM1.5G in the Stack tab: from the click on the
  // search button to its result shown, each run on a newly opened page (the first search
  // also starts the background worker), then repeated on one page
  const searchOnce = async (page) => {
    await page.evaluate(() => {
      window.__searchClick = null;
      window.__searchShown = null;
      const button = document.querySelector('[data-action="optimize"]');
      button.addEventListener('click', () => { window.__searchClick = performance.now(); }, { capture: true, once: true });
      const out = document.querySelector('[data-info="optimize"]');
      const seen = new MutationObserver(() => {
        if (!out.hidden && /^Best 3-junction/.test(out.textContent)) {
          window.__searchShown = performance.now();
          seen.disconnect();
        }
      });
      seen.observe(out, { subtree: true, childList: true, characterData: true, attributes: true });
    });
    await page.locator('[data-action="optimize"]').click();
    await page.waitForFunction(() => window.__searchShown !== null, null, { timeout: 120000 });
    return page.evaluate(() => window.__searchShown - window.__searchClick);
  };
  const openThree = async () => {
    const { context, page } = await openStack();
    await page.locator('[data-control="junctions"]').selectOption('3');
    await page.locator('[data-control="gap-3"]').waitFor();
    return { context, page };
  };
  const cold = [];
  for (let i = 0; i < 5; i++) {
    const { context, page } = await openThree();
    cold.push(await searchOnce(page));
    await context.close();
  }
  const warm = [];
  {
    const { context, page } = await openThree();
    await searchOnce(page);
    for (let i = 0; i < 5; i++) {
      // from the same design each time: back to three junctions at the default gaps
      await page.locator('[data-control="junctions"]').selectOption('2');
      await page.locator('[data-control="gap-3"]').waitFor({ state: 'detached' });
      await page.locator('[data-control="gap-1"]').fill('1.7');
      await page.locator('[data-control="gap-2"]').fill('1.1');
      await page.locator('[data-control="junctions"]').selectOption('3');
      await page.locator('[data-control="gap-3"]').waitFor();
      warm.push(await searchOnce(page));
    }
    await context.close();
  }
  cold.sort((a, b) => a - b);
  warm.sort((a, b) => a - b);
  console.log(`browser search_3j_series_ms median=${pct(cold, 0.5).toFixed(0)} max=${cold[cold.length - 1].toFixed(0)} (new page, worker started) warm_median=${pct(warm, 0.5).toFixed(0)} n=${cold.length}+${warm.length} (goal: new page median < 50)`);

  // the two-junction series map on AM1.5G at 201 x 201: the page's own busy time for the
  // computation (its slices between turns of the event loop), as the map's legend states it
  {
    const { context, page } = await openStack();
    const timing = page.locator('[data-info="map-timing"]');
    const busy = [];
    for (let i = 0; i < 4; i++) {
      for (const points of ['121', '201']) {
        await page.locator('[data-control="map-points"]').selectOption(points);
        await page.waitForFunction(
          (p) => new RegExp(`^${p}×${p} stacks in \\d+ ms`).test(document.querySelector('[data-info="map-timing"]')?.textContent ?? ''),
          points,
          { timeout: 60000 },
        );
      }
      const text = await timing.textContent();
      busy.push(Number(/stacks in (\d+) ms/.exec(text)[1]));
    }
    busy.sort((a, b) => a - b);
    console.log(`browser map_201x201_series_ms median=${pct(busy, 0.5)} max=${busy[busy.length - 1]} n=${busy.length} (goal: median < 30)`);
    await context.close();
  }
} finally {
  await browser.close();
  await server.close();
}

// transfer size: what a first visit downloads (wasm + js + css), gzipped
const visit = firstVisit(DIST);
console.log(`browser transfer_kb gzipped=${(visit.total.gz / 1024).toFixed(1)} raw=${(visit.total.raw / 1024).toFixed(1)} wasm_raw=${((visit.parts.wasm?.raw || 0) / 1024).toFixed(1)} (goal: gzipped <= ${BUDGET_KB.total})`);
