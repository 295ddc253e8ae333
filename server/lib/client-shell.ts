// The app's page (dist/index.html) as the server sends it for every address the client routes. For
// a signed-in visitor it carries hints for what that address needs first: the page's own code (and
// the chunks it imports, from Vite's build manifest) and the API reads the app makes on start
// (src/shared/early-reads.ts). The phone then fetches these alongside the app's entry script
// instead of after it has run. The offline worker keeps its own plain copy; hints are only a speed-up.
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { earlyReads, walkIdOf } from '../../src/shared/early-reads';

interface ManifestChunk {
  file: string;
  imports?: string[];
  isEntry?: boolean;
}
type Manifest = Record<string, ManifestChunk>;

/** Source modules of the pages worth hinting: the ones a technician opens from a link or a reload. */
export const HINTED_PAGES: { match: (pathname: string) => boolean; module: string }[] = [
  { match: (p) => walkIdOf(p) !== null, module: 'src/features/walks/components/walk-runner-page.tsx' },
  { match: (p) => p === '/', module: 'src/app/routes/home.tsx' },
  { match: (p) => p === '/search' || p === '/search/', module: 'src/features/search/components/search-page.tsx' },
];

export interface ClientShell {
  /** The page for this address; `signedIn` says whether the request carries a session cookie. */
  html(pathname: string, signedIn: boolean): string;
}

/** Files a chunk needs before it runs: its own and, depth first, every static import but the entry's. */
export function chunkFiles(manifest: Manifest, key: string): string[] {
  const out: string[] = [];
  const seen = new Set<string>();
  const visit = (k: string) => {
    if (seen.has(k)) return;
    seen.add(k);
    const chunk = manifest[k];
    if (!chunk || chunk.isEntry) return;
    out.push(chunk.file);
    for (const i of chunk.imports ?? []) visit(i);
  };
  visit(key);
  return out;
}

const escapeAttr = (s: string) => s.replace(/&/g, '&amp;').replace(/"/g, '&quot;').replace(/</g, '&lt;');

export function loadClientShell(clientDir: string): ClientShell {
  const page = readFileSync(join(clientDir, 'index.html'), 'utf8');
  const manifestPath = join(clientDir, '.vite', 'manifest.json');
  const manifest: Manifest = existsSync(manifestPath) ? JSON.parse(readFileSync(manifestPath, 'utf8')) : {};
  const pageFiles = HINTED_PAGES.map((p) => ({ match: p.match, files: chunkFiles(manifest, p.module) }));
  const cut = page.indexOf('</head>');
  return {
    html(pathname, signedIn) {
      if (!signedIn || cut < 0) return page;
      const files = pageFiles.find((p) => p.match(pathname))?.files ?? [];
      // `crossorigin` on both, as the app's own module scripts and fetches use: otherwise the browser
      // would not reuse what it fetched early and would ask a second time.
      const links = [
        ...earlyReads(pathname).map((path) => `<link rel="preload" as="fetch" crossorigin href="${escapeAttr(path)}">`),
        ...files.map((f) => `<link rel="modulepreload" crossorigin href="/${escapeAttr(f)}">`),
      ];
      return `${page.slice(0, cut)}${links.join('')}${page.slice(cut)}`;
    },
  };
}
