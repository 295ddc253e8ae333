// Pareto ordering of cause counts: most frequent first, with each bar's share and the running share,
// so a manager sees which few causes make up most of the trouble.

export interface CauseCount {
  code: string;
  count: number;
}

export interface ParetoBar extends CauseCount {
  percent: number;
  cumulativePercent: number;
}

export function pareto(counts: readonly CauseCount[]): ParetoBar[] {
  const merged = new Map<string, number>();
  for (const c of counts) if (c.count > 0) merged.set(c.code, (merged.get(c.code) ?? 0) + c.count);
  const total = [...merged.values()].reduce((a, b) => a + b, 0);
  // No causes means no shares at all: an empty list, never a division by zero.
  if (total === 0) return [];
  // Ties break on the code so the order is stable from one request to the next.
  const sorted = [...merged].map(([code, count]) => ({ code, count })).sort((a, b) => b.count - a.count || (a.code < b.code ? -1 : a.code > b.code ? 1 : 0));
  let running = 0;
  return sorted.map((c) => {
    running += c.count;
    return { ...c, percent: (100 * c.count) / total, cumulativePercent: (100 * running) / total };
  });
}
