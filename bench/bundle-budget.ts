// `npm run bench:bundle`: the JavaScript a phone downloads before the home page, search and the
// walk runner can run — index.html's entry chunk plus each page's route chunk and everything
// those import statically — gzipped, from Vite's manifest. Fails above the budget so a heavy
// library creeping into these pages is caught before a technician on one bar of signal is.
// `--build` rebuilds dist/ first; otherwise the existing dist/ is read.
import { existsSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { gzipSync } from 'node:zlib';

export const BUDGET_KB = 180;

/** A page: the source modules its route renders. Modules bundled into the entry are covered by it. */
export const PAGES: { name: string; path: string; modules: string[] }[] = [
  { name: 'home', path: '/', modules: ['src/app/routes/home.tsx'] },
  { name: 'search', path: '/search', modules: ['src/features/search/components/search-page.tsx'] },
  { name: 'walk runner', path: '/walks/:id', modules: ['src/features/walks/components/walk-runner-page.tsx'] },
];

/** Loaded by the signed-in frame right after the page renders, on every page: reported, not budgeted. */
export const AFTER_RENDER = ['src/features/search/components/header-search.tsx'];

interface ManifestChunk {
  file: string;
  isEntry?: boolean;
  imports?: string[];
  dynamicImports?: string[];
}
type Manifest = Record<string, ManifestChunk>;

export interface PageSize {
  name: string;
  path: string;
  files: string[];
  gzipBytes: number;
  rawBytes: number;
  /** What the frame fetches once the page is up, beyond the files above. */
  afterRenderGzipBytes: number;
}

export function measurePages(distDir: string): PageSize[] {
  const manifest = JSON.parse(readFileSync(join(distDir, '.vite', 'manifest.json'), 'utf8')) as Manifest;
  const entry = Object.keys(manifest).find((k) => manifest[k].isEntry);
  if (!entry) throw new Error('The manifest has no entry chunk');
  const sizes = new Map<string, { raw: number; gzip: number }>();
  const sizeOf = (file: string) => {
    let s = sizes.get(file);
    if (!s) {
      const bytes = readFileSync(join(distDir, file));
      s = { raw: bytes.length, gzip: gzipSync(bytes).length };
      sizes.set(file, s);
    }
    return s;
  };
  // Static imports only: what the browser must fetch before the page can render.
  const collect = (key: string, into: Set<string>) => {
    const chunk = manifest[key];
    if (!chunk || into.has(chunk.file)) return;
    into.add(chunk.file);
    for (const k of chunk.imports ?? []) collect(k, into);
  };
  return PAGES.map((page) => {
    const files = new Set<string>();
    collect(entry, files);
    for (const m of page.modules) collect(m, files);
    const list = [...files].filter((f) => f.endsWith('.js'));
    const later = new Set(files);
    for (const m of AFTER_RENDER) collect(m, later);
    const afterRender = [...later].filter((f) => f.endsWith('.js') && !files.has(f));
    return {
      name: page.name,
      path: page.path,
      files: list,
      rawBytes: list.reduce((n, f) => n + sizeOf(f).raw, 0),
      gzipBytes: list.reduce((n, f) => n + sizeOf(f).gzip, 0),
      afterRenderGzipBytes: afterRender.reduce((n, f) => n + sizeOf(f).gzip, 0),
    };
  });
}

const kb = (bytes: number) => (bytes / 1024).toFixed(1);

async function main() {
  const root = resolve(import.meta.dirname, '..');
  const dist = join(root, 'dist');
  if (process.argv.includes('--build') || !existsSync(join(dist, '.vite', 'manifest.json'))) {
    console.log('Building the client (vite build)...');
    const { build } = await import('vite');
    await build({ root, logLevel: 'warn' });
  }
  const pages = measurePages(dist);
  console.log(`JavaScript per page, gzip (budget ${BUDGET_KB} KB):`);
  for (const p of pages) {
    const mark = p.gzipBytes / 1024 > BUDGET_KB ? '  OVER BUDGET' : '';
    console.log(
      `  ${p.name.padEnd(12)} ${p.path.padEnd(11)} ${kb(p.gzipBytes).padStart(6)} KB gzip  ${kb(p.rawBytes).padStart(7)} KB raw  ${p.files.length} files  (+${kb(p.afterRenderGzipBytes)} KB after render)${mark}`,
    );
  }
  const largest = pages.reduce((a, b) => (b.gzipBytes > a.gzipBytes ? b : a));
  console.log(`Largest page bundle: ${largest.name}, ${kb(largest.gzipBytes)} KB gzip (${largest.files.join(', ')})`);
  const over = pages.filter((p) => p.gzipBytes / 1024 > BUDGET_KB);
  if (over.length) {
    console.error(`Over the ${BUDGET_KB} KB budget: ${over.map((p) => p.name).join(', ')}`);
    process.exit(1);
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  main().catch((err) => {
    console.error(err);
    process.exit(1);
  });
}
