// What a first visit downloads: the page's WebAssembly, JavaScript and stylesheet (the
// service worker too, which the page registers on load), each gzipped at level 9 as a
// server would send it, against the budget of each part and of the whole. Run by .ci/test
// after the web build; `node tests/browser/size.mjs [--report] [DIST]`. Exits 1 over budget,
// unless --report (print only).
import fs from 'node:fs';
import path from 'node:path';
import zlib from 'node:zlib';

/** Budgets in KB (1024 bytes), gzipped; see DEVELOPERS.md, "The web build". */
export const BUDGET_KB = { wasm: 925, js: 16, css: 10, total: 945 };

/** Sizes in bytes of the first visit's files in `dist`, by kind, raw and gzipped. */
export function firstVisit(dist) {
  const parts = {};
  for (const f of fs.readdirSync(dist)) {
    const m = f.match(/\.(wasm|js|css)$/);
    if (!m) continue;
    const b = fs.readFileSync(path.join(dist, f));
    const kind = m[1];
    parts[kind] ??= { raw: 0, gz: 0, files: [] };
    parts[kind].raw += b.length;
    parts[kind].gz += zlib.gzipSync(b, { level: 9 }).length;
    parts[kind].files.push(f);
  }
  const total = Object.values(parts).reduce((a, p) => ({ raw: a.raw + p.raw, gz: a.gz + p.gz }), { raw: 0, gz: 0 });
  return { parts, total };
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const args = process.argv.slice(2);
  const report = args.includes('--report');
  const dist = args.find((a) => a !== '--report') || process.env.GLOWGAP_DIST || path.resolve(import.meta.dirname, '../../dist');
  const { parts, total } = firstVisit(dist);
  const kb = (b) => (b / 1024).toFixed(1);
  let over = false;
  for (const [kind, p] of Object.entries(parts)) {
    const budget = BUDGET_KB[kind];
    const bad = budget !== undefined && p.gz / 1024 > budget;
    over ||= bad;
    console.log(`first visit ${kind.padEnd(4)} ${kb(p.gz).padStart(7)} KB gzipped (${kb(p.raw)} KB raw; budget ${budget ?? '-'} KB)${bad ? '  OVER BUDGET' : ''}`);
  }
  const bad = total.gz / 1024 > BUDGET_KB.total;
  over ||= bad;
  console.log(`first visit total ${kb(total.gz)} KB gzipped (${kb(total.raw)} KB raw; budget ${BUDGET_KB.total} KB)${bad ? '  OVER BUDGET' : ''}`);
  process.exit(over && !report ? 1 : 0);
}
