// Text helpers shared by both engines: safe highlight markup and the synonym map of a tsquery.
import { MARK_CLOSE, MARK_OPEN } from './search.documents';

const ESCAPES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };

/**
 * Escapes everything, then turns the engine's private delimiters into <mark>. The delimiters are
 * stripped from content when it is indexed, so the only tag a result can ever carry is <mark>.
 */
export function markedHtml(text: string): string {
  let open = false;
  let out = '';
  for (const ch of text) {
    if (ch === MARK_OPEN) {
      if (!open) out += '<mark>';
      open = true;
    } else if (ch === MARK_CLOSE) {
      if (open) out += '</mark>';
      open = false;
    } else out += ESCAPES[ch] ?? ch;
  }
  return open ? `${out}</mark>` : out;
}

/** Lexeme → the tsquery text of its whole synonym group, e.g. drip → ( 'drip' | 'drool' | 'dribbl' ). */
export type SynonymMap = Map<string, string>;

export function buildSynonymMap(terms: { group: number; query: string }[]): SynonymMap {
  const groups = new Map<number, string[]>();
  for (const t of terms) if (t.query) groups.set(t.group, [...(groups.get(t.group) ?? []), t.query]);
  const members = new Map<string, Set<string>>();
  for (const queries of groups.values()) {
    for (const q of queries) {
      const single = /^'((?:[^']|'')*)'$/.exec(q);
      if (!single) continue; // phrases are substitutes, never targets
      const lexeme = single[1].replace(/''/g, "'");
      const set = members.get(lexeme) ?? new Set<string>();
      for (const other of queries) set.add(other.includes('<->') ? `( ${other} )` : other);
      members.set(lexeme, set);
    }
  }
  const map: SynonymMap = new Map();
  for (const [lexeme, set] of members) map.set(lexeme, set.size > 1 ? `( ${[...set].join(' | ')} )` : [...set][0]);
  return map;
}

/** The map as the search query takes it: each lexeme in its quoted tsquery form, and what replaces it. */
export function synonymPairs(map: SynonymMap): { tokens: string[]; substitutes: string[] } {
  const tokens: string[] = [];
  const substitutes: string[] = [];
  for (const [lexeme, sub] of map) {
    tokens.push(`'${lexeme.replace(/'/g, "''")}'`);
    substitutes.push(sub);
  }
  return { tokens, substitutes };
}

/** Words of a query worth spelling-checking: letters, three or more, no numbers. */
export function checkableWords(words: string[]): string[] {
  return [...new Set(words.filter((w) => w.length >= 3 && w.length <= 40 && /^\p{L}[\p{L}']*$/u.test(w)))].slice(0, 8);
}
