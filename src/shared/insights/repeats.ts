// Repeat failures: the same cause on the same applicator again within a set number of days, a sign
// the first fix treated the symptom rather than the cause.

export interface CauseEvent {
  applicatorId: number;
  code: string;
  /** YYYY-MM-DD */
  on: string;
}

export interface RepeatFailure {
  applicatorId: number;
  code: string;
  firstOn: string;
  repeatOn: string;
  daysApart: number;
}

const DAY_MS = 86_400_000;

export function daysApart(from: string, to: string): number {
  return Math.round((Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / DAY_MS);
}

/** Each event that follows an earlier one of the same cause on the same applicator within `withinDays`. */
export function repeatFailures(events: readonly CauseEvent[], withinDays: number): RepeatFailure[] {
  const groups = new Map<string, CauseEvent[]>();
  for (const e of events) {
    const key = `${e.applicatorId}\u0000${e.code}`;
    const list = groups.get(key);
    if (list) list.push(e);
    else groups.set(key, [e]);
  }
  const out: RepeatFailure[] = [];
  for (const list of groups.values()) {
    list.sort((a, b) => (a.on < b.on ? -1 : a.on > b.on ? 1 : 0));
    for (let i = 1; i < list.length; i++) {
      // Compared with the one just before: a chain of three close failures gives two repeats, not three.
      const gap = daysApart(list[i - 1].on, list[i].on);
      if (gap <= withinDays) out.push({ applicatorId: list[i].applicatorId, code: list[i].code, firstOn: list[i - 1].on, repeatOn: list[i].on, daysApart: gap });
    }
  }
  return out.sort((a, b) => (a.repeatOn < b.repeatOn ? 1 : a.repeatOn > b.repeatOn ? -1 : a.applicatorId - b.applicatorId));
}
