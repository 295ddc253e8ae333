// `npm run search:reindex`: rebuilds the search documents from the guide and article tables, and
// Meilisearch's indexes too when MEILI_URL and MEILI_API_KEY are set, showing progress as it goes.
import { ConfigSchema } from '../server/config/env';
import { createDb, migrateLatest } from '../server/db/knex';
import { loadSources, type SearchSource } from '../server/modules/search/search.documents';
import { createMeiliEngine } from '../server/modules/search/search.meili';
import { searchRepository as repo } from '../server/modules/search/search.repository';
import { localDatabaseUrl } from './lib/local-env';

const BATCH = 500;
const env = ConfigSchema.pick({ MEILI_URL: true, MEILI_API_KEY: true, MEILI_TIMEOUT_MS: true }).parse(process.env);

function progress(label: string) {
  const tty = process.stdout.isTTY;
  let lastTenth = -1;
  return (done: number, total: number) => {
    const share = total ? done / total : 1;
    if (tty) {
      const bar = '#'.repeat(Math.round(share * 30)).padEnd(30, '.');
      process.stdout.write(`\r${label.padEnd(28)} [${bar}] ${done}/${total}`);
      if (done >= total) process.stdout.write('\n');
    } else if (Math.floor(share * 10) > lastTenth || done >= total) {
      lastTenth = Math.floor(share * 10);
      console.log(`${label}: ${done}/${total}`);
    }
  };
}

const db = createDb(await localDatabaseUrl(), { max: 4 });
try {
  await migrateLatest(db);
  const started = await repo.now(db);
  const meili = env.MEILI_URL && env.MEILI_API_KEY ? createMeiliEngine({ url: env.MEILI_URL, apiKey: env.MEILI_API_KEY, timeoutMs: env.MEILI_TIMEOUT_MS }) : null;
  const orgs: number[] = (await db('organisations').orderBy('id').select('id')).map((o) => o.id);
  console.log(`Rebuilding search for ${orgs.length} organisation(s) with PostgreSQL${meili ? ` and Meilisearch at ${meili.url}` : ''}.`);

  for (const org of orgs) {
    const articles: number[] = (await db('articles').where({ organisation_id: org }).orderBy('id').select('id')).map((r) => r.id);
    const guides: number[] = (await db('guides').where({ organisation_id: org }).orderBy('id').select('id')).map((r) => r.id);
    await repo.ensureSynonyms(db, org);
    if (meili) {
      await meili.configure(org, await repo.listSynonyms(db, org));
      await meili.clear(org);
    }
    // Documents whose source row no longer exists have nothing to rebuild from: remove them first.
    await db('search_documents')
      .where({ organisation_id: org })
      .where((w) =>
        w
          .where('kind', 'article')
          .whereNotIn('ref_id', db('articles').select('id'))
          .orWhere((g) => g.where('kind', 'guide').whereNotIn('ref_id', db('guides').select('id'))),
      )
      .delete();
    for (const [kind, ids] of [
      ['guide', guides],
      ['article', articles],
    ] as const) {
      const show = progress(`organisation ${org}: ${kind}s`);
      show(0, ids.length);
      for (let i = 0; i < ids.length; i += BATCH) {
        const found = await loadSources(db, kind, ids.slice(i, i + BATCH));
        const visible = [...found.values()].filter((s): s is SearchSource => s !== null);
        const gone = [...found.entries()].filter(([, s]) => s === null).map(([refId]) => ({ kind, refId }));
        await repo.upsertDocuments(db, visible);
        await repo.deleteDocuments(
          db,
          kind,
          gone.map((g) => g.refId),
        );
        if (meili && visible.length) await meili.apply(org, visible, []);
        show(Math.min(i + BATCH, ids.length), ids.length);
      }
    }
    await repo.rebuildWords(db, org);
  }
  // What was rebuilt needs no job any more; changes made while this ran keep theirs.
  await db('search_jobs')
    .where('stamp', '<=', started)
    .whereIn('target', meili ? ['postgres', 'meilisearch'] : ['postgres'])
    .update({ status: 'done', synced_stamp: db.ref('stamp'), attempts: 0, last_error: null, updated_at: db.fn.now() });
  const counts = await repo.documentCounts(db);
  console.log(`Done: ${counts.guides} guides and ${counts.articles} articles searchable, ${counts.words} words for typo tolerance.`);
} finally {
  await db.destroy();
}
