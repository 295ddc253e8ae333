// Statements on the hot paths (search as you type, answering a walk step) run as named prepared
// statements: PostgreSQL parses and plans each once per connection instead of on every request,
// and the statement text is built once, not by Knex's query builder each time. Knex's raw() cannot
// name statements, so these go to one of Knex's pooled connections directly. Inside a transaction
// they run on the transaction's own connection through raw(), unnamed, with the same text.
import { createHash } from 'node:crypto';
import type { Knex } from 'knex';

interface PgConnection {
  query(q: { name: string; text: string; values: unknown[] }): Promise<{ rows: any[] }>; // eslint-disable-line @typescript-eslint/no-explicit-any
}

const names = new Map<string, { name: string; text: string }>();

/** `sql` uses Knex's `?` placeholders; the statement's name is derived from its text. */
function named(sql: string): { name: string; text: string } {
  let found = names.get(sql);
  if (!found) {
    let n = 0;
    const text = sql.replace(/\?/g, () => `$${++n}`);
    found = { name: `bp_${createHash('sha1').update(text).digest('hex').slice(0, 20)}`, text };
    // Statement texts are fixed strings in the code (a handful of variants each), not user input.
    if (names.size < 1000) names.set(sql, found);
  }
  return found;
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any
export async function preparedQuery(db: Knex, sql: string, bindings: readonly unknown[]): Promise<{ rows: any[] }> {
  if (db.isTransaction) return (await db.raw(sql, bindings as Knex.RawBinding[])) as { rows: any[] }; // eslint-disable-line @typescript-eslint/no-explicit-any
  const { name, text } = named(sql);
  const client = db.client as { acquireConnection(): Promise<PgConnection>; releaseConnection(c: PgConnection): Promise<void> };
  const conn = await client.acquireConnection();
  try {
    return await conn.query({ name, text, values: [...bindings] });
  } finally {
    await client.releaseConnection(conn);
  }
}
