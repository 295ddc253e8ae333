// Reads the built dist/ (npm test builds it first; skipped when there is none) and checks what a
// phone downloads for home, search and the walk runner: within budget, and none of the heavy
// authoring, chart or table libraries leaking in.
import { existsSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { BUDGET_KB, measurePages } from '../../bench/bundle-budget';

const dist = join(resolve(import.meta.dirname, '../..'), 'dist');
const built = existsSync(join(dist, '.vite', 'manifest.json'));

// No page has an exception: the walk runner loads its calculator form only on Measure steps that use one.
const CEILING_KB: Record<string, number> = {};

// Strings that survive minification in each heavy library's own code.
const HEAVY: Record<string, RegExp> = {
  'TipTap / ProseMirror': /ProseMirror-|prosemirror/,
  xyflow: /react-flow__/,
  Recharts: /recharts-/,
  'TanStack Table': /getCoreRowModel/,
  dagre: /dagre/i,
};

describe.skipIf(!built)('bundle budget on the built client', () => {
  const pages = built ? measurePages(dist) : [];

  it(`when home, search and the walk runner load, then each stays within ${BUDGET_KB} KB gzip (or its recorded ceiling)`, () => {
    for (const p of pages) expect(p.gzipBytes / 1024, p.name).toBeLessThanOrEqual(CEILING_KB[p.name] ?? BUDGET_KB);
  });

  it('when those pages load, then no editor, chart or table library comes with them', () => {
    for (const p of pages) {
      const code = p.files.map((f) => readFileSync(join(dist, f), 'utf8')).join('\n');
      for (const [name, marker] of Object.entries(HEAVY)) expect(marker.test(code), `${name} in ${p.name}`).toBe(false);
    }
  });
});
