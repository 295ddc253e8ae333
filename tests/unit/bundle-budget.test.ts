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

// The walk runner's first view does without these: zod (the schemas' validation) and the calculators
// load only when a walk answers a Measure step that routes through a calculator. Each marker is text
// that survives minification: names zod 4 builds into its classes and messages, calculator titles
// and a message of the calculator runner.
const RUNNER_LATER: Record<string, RegExp> = {
  zod: /\$ZodType|Too big: expected/,
  calculators: /Needle flow \(Newtonian fluid\)|Viscosity at another temperature|must be given as a number and a unit/,
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

  it('when the walk runner loads, then neither zod nor the calculators come with it', () => {
    const runner = pages.find((p) => p.name === 'walk runner');
    expect(runner).toBeDefined();
    for (const file of runner!.files) {
      const code = readFileSync(join(dist, file), 'utf8');
      for (const [name, marker] of Object.entries(RUNNER_LATER)) expect(marker.test(code), `${name} in ${file}`).toBe(false);
    }
  });
});
