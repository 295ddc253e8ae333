// The sync job: finds guides and articles changed since the watermark, queues one job per engine,
// and applies the queue to PostgreSQL's search table and, when configured, to Meilisearch.
// It runs in-process on an interval; tests and scripts run it on demand with syncSearch(db).
import type { Knex } from 'knex';
import type { Logger } from 'pino';
import type { SearchEngineName, SearchKind } from '../../../src/shared/schemas/search';
import { loadSources, type SearchSource } from './search.documents';
import { describe, type MeiliEngine, type MeiliHealth } from './search.meili';
import { searchRepository as repo, type ClaimedJob } from './search.repository';

export const SYNC_INTERVAL_MS = 1000;
const BATCH = 500;
const MAX_ROUNDS = 200;
const MAX_ATTEMPTS = 10;
/** The vocabulary is rebuilt at most this often per organisation while content keeps changing. */
const WORDS_EVERY_MS = 5000;
/** Source rows are checked for deletion every this many ticks (an anti-join over the search table). */
const DELETION_SCAN_EVERY = 10;

export interface SyncOptions {
  /** Check for deleted sources, retry Meilisearch now and rebuild the vocabulary, whatever the timers say. */
  force?: boolean;
}

export interface SyncDeps {
  db: Knex;
  logger: Logger;
  meili: MeiliEngine | null;
  health: MeiliHealth | null;
}

export function createSync(deps: SyncDeps) {
  const { db, logger, meili, health } = deps;
  const targets: SearchEngineName[] = meili ? ['postgres', 'meilisearch'] : ['postgres'];
  let chain: Promise<unknown> = Promise.resolve();
  let timer: NodeJS.Timeout | null = null;
  let stopped = false;
  let ticks = 0;
  let lastLoggedError: string | null = null;
  let meiliSeeded = false;
  const dirtyWords = new Set<number>();
  const wordsBuiltAt = new Map<number, number>();

  async function scan(force: boolean) {
    const state = await repo.syncState(db);
    const scanStart = await repo.now(db);
    if (meili && !meiliSeeded) {
      // First run with Meilisearch configured: everything already published must reach it too.
      if (!(await repo.hasJobs(db, 'meilisearch'))) await repo.enqueueAll(db, ['meilisearch']);
      meiliSeeded = true;
    }
    let queued = await repo.enqueueChanges(db, targets, state.watermark);
    if (force || ticks % DELETION_SCAN_EVERY === 0) queued += await repo.enqueueDeletions(db, targets);
    return { scanStart, queued };
  }

  /** Loads the sources of a batch of jobs: published ones to (re)index, the rest to remove. */
  async function sourcesFor(jobs: ClaimedJob[]) {
    const visible: SearchSource[] = [];
    const gone: { kind: SearchKind; refId: number; organisationId: number }[] = [];
    for (const kind of ['guide', 'article'] as const) {
      const ids = jobs.filter((j) => j.kind === kind).map((j) => j.refId);
      if (!ids.length) continue;
      const found = await loadSources(db, kind, ids);
      for (const j of jobs.filter((x) => x.kind === kind)) {
        const s = found.get(j.refId);
        if (s) visible.push(s);
        else gone.push({ kind, refId: j.refId, organisationId: j.organisationId });
      }
    }
    return { visible, gone };
  }

  async function applyPostgres(jobs: ClaimedJob[]) {
    const { visible, gone } = await sourcesFor(jobs);
    await db.transaction(async (trx) => {
      await repo.upsertDocuments(trx, visible);
      for (const kind of ['guide', 'article'] as const)
        await repo.deleteDocuments(
          trx,
          kind,
          gone.filter((g) => g.kind === kind).map((g) => g.refId),
        );
    });
    for (const j of jobs) dirtyWords.add(j.organisationId);
  }

  async function applyMeili(jobs: ClaimedJob[]) {
    const m = meili!;
    const orgs = [...new Set(jobs.map((j) => j.organisationId))];
    for (const org of orgs) {
      const mine = jobs.filter((j) => j.organisationId === org);
      const synonyms = async () => {
        await repo.ensureSynonyms(db, org);
        return repo.listSynonyms(db, org);
      };
      if (mine.some((j) => j.kind === 'settings')) await m.configure(org, await synonyms());
      else await m.ensure(org, synonyms);
      const { visible, gone } = await sourcesFor(mine.filter((j) => j.kind !== 'settings'));
      await m.apply(org, visible, gone);
    }
  }

  /** Applies due jobs in batches; a failing batch is retried job by job so one bad item cannot hold up the rest. */
  async function drain(target: SearchEngineName, apply: (jobs: ClaimedJob[]) => Promise<void>): Promise<number> {
    let applied = 0;
    for (let round = 0; round < MAX_ROUNDS && !stopped; round++) {
      const jobs = await repo.claim(db, target, BATCH);
      if (!jobs.length) break;
      try {
        await apply(jobs);
        await repo.complete(db, jobs);
        applied += jobs.length;
      } catch (err) {
        if (target === 'meilisearch') {
          health?.failure(err, 'indexing');
          await repo.fail(db, jobs, describe(err), MAX_ATTEMPTS);
          break;
        }
        for (const job of jobs) {
          try {
            await apply([job]);
            await repo.complete(db, [job]);
            applied++;
          } catch (one) {
            logger.warn({ kind: job.kind, id: job.refId, error: describe(one) }, 'search could not index an item; it will be retried');
            await repo.fail(db, [job], describe(one), MAX_ATTEMPTS);
          }
        }
      }
    }
    return applied;
  }

  async function rebuildWords(force: boolean) {
    const now = Date.now();
    for (const org of [...dirtyWords]) {
      if (!force && now - (wordsBuiltAt.get(org) ?? 0) < WORDS_EVERY_MS) continue;
      dirtyWords.delete(org);
      wordsBuiltAt.set(org, now);
      await repo.rebuildWords(db, org);
    }
  }

  async function runOnce(opts: SyncOptions = {}): Promise<Error | null> {
    const force = Boolean(opts.force);
    try {
      const { scanStart, queued } = await scan(force);
      let applied = await drain('postgres', applyPostgres);
      if (meili && health) {
        if (health.failing && (force || health.shouldTry())) {
          try {
            await meili.probe();
            await health.success();
          } catch (err) {
            health.failure(err, 'health check');
          }
        }
        if (!health.failing) applied += await drain('meilisearch', applyMeili);
      }
      await rebuildWords(force);
      await repo.finishScan(db, scanStart, queued + applied > 0, null);
      lastLoggedError = null;
      return null;
    } catch (err) {
      const message = describe(err);
      // A database outage would otherwise log every second.
      if (message !== lastLoggedError && !stopped) logger.warn({ error: message }, 'search sync failed; it will try again');
      lastLoggedError = message;
      return err instanceof Error ? err : new Error(message);
    } finally {
      ticks++;
    }
  }

  /** Runs one sync after any that is already running, and resolves when it is done. */
  function syncNow(opts: SyncOptions = {}): Promise<Error | null> {
    const run = chain.then(() => runOnce(opts));
    chain = run;
    return run;
  }

  function schedule(intervalMs: number) {
    if (stopped) return;
    timer = setTimeout(() => {
      void syncNow().finally(() => schedule(intervalMs));
    }, intervalMs);
    timer.unref();
  }

  return {
    syncNow,
    /** Re-queues everything for every engine (or one organisation's items) and lets the job pick it up. */
    async enqueueAll(organisationId?: number) {
      return repo.enqueueAll(db, targets, organisationId);
    },
    start(intervalMs = SYNC_INTERVAL_MS) {
      stopped = false;
      schedule(intervalMs);
    },
    async stop() {
      stopped = true;
      if (timer) clearTimeout(timer);
      timer = null;
      await chain;
    },
  };
}

export type SearchSync = ReturnType<typeof createSync>;

// Each running app registers its sync under its database handle, so tests and shutdown can reach it.
const running = new Map<Knex, Set<SearchSync>>();

export function registerSync(db: Knex, sync: SearchSync) {
  const set = running.get(db) ?? new Set();
  set.add(sync);
  running.set(db, set);
}

/** Runs the sync of every app on this database now, and waits for it (tests, scripts). */
export async function syncSearch(db: Knex, opts: SyncOptions = { force: true }) {
  const syncs = running.get(db);
  const list = syncs?.size ? [...syncs] : [createSync({ db, logger: silentLogger, meili: null, health: null })];
  for (const s of list) {
    const err = await s.syncNow(opts);
    if (err) throw err;
  }
}

/** Stops the timers of every app on this database (createApp's close hook). */
export async function stopSearch(db: Knex) {
  const syncs = running.get(db);
  if (!syncs) return;
  running.delete(db);
  await Promise.all([...syncs].map((s) => s.stop()));
}

const noop = () => {};
const silentLogger = { warn: noop, info: noop, error: noop, debug: noop } as unknown as Logger;
