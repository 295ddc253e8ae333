// Answers waiting to reach the server, kept in IndexedDB so a dropped connection, a reload or a
// flat battery loses nothing. Entries are sent in order; the server accepts each id once.
const DB_NAME = 'beadpath';
const STORE = 'walk-queue';

export interface QueuedEntry {
  /** The entry's own client id (idempotency key). */
  id: string;
  walkId: number;
  /** 'answer' goes to the answer log; 'note' to the walk's notes. */
  type: 'answer' | 'note';
  body: Record<string, unknown>;
  queuedAt: number;
}

function open(): Promise<IDBDatabase> {
  return new Promise((resolve, reject) => {
    const req = indexedDB.open(DB_NAME, 1);
    req.onupgradeneeded = () => {
      const db = req.result;
      if (!db.objectStoreNames.contains(STORE)) {
        const store = db.createObjectStore(STORE, { keyPath: 'id' });
        store.createIndex('walk', 'walkId');
      }
    };
    req.onsuccess = () => resolve(req.result);
    req.onerror = () => reject(req.error);
  });
}

async function tx<T>(mode: IDBTransactionMode, fn: (s: IDBObjectStore) => IDBRequest<T>): Promise<T> {
  const db = await open();
  return new Promise((resolve, reject) => {
    const t = db.transaction(STORE, mode);
    const req = fn(t.objectStore(STORE));
    t.oncomplete = () => {
      db.close();
      resolve(req.result);
    };
    t.onerror = () => {
      db.close();
      reject(t.error);
    };
  });
}

export async function enqueue(entry: QueuedEntry): Promise<void> {
  await tx('readwrite', (s) => s.put(entry));
  notify();
}

export async function pending(walkId: number): Promise<QueuedEntry[]> {
  const all = await tx<QueuedEntry[]>('readonly', (s) => s.index('walk').getAll(walkId));
  return all.sort((a, b) => a.queuedAt - b.queuedAt);
}

export async function remove(id: string): Promise<void> {
  await tx('readwrite', (s) => s.delete(id));
  notify();
}

const listeners = new Set<() => void>();
function notify() {
  for (const l of listeners) l();
}
export function onQueueChange(l: () => void): () => void {
  listeners.add(l);
  return () => listeners.delete(l);
}

export function newClientId(): string {
  return crypto.randomUUID();
}
