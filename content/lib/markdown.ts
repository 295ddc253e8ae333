// The small Markdown dialect demo articles are written in, turned into the editor's TipTap JSON at
// load time. Only what the rich-text vocabulary can hold is understood; anything else is an error
// with its line number, so a typo never reaches the demo as stray text.
import type { TipTapNode } from '../../src/shared/rich-text/extensions';
import { HAZARD_KEYS } from '../../src/shared/tags';

/**
 * How references in the text become real addresses: `![alt](drawing:KEY)` needs the stored file's
 * id and `[text](article:KEY)` the article's id. Return undefined for an unknown key.
 */
export interface MarkdownResolver {
  drawing(key: string): string | undefined;
  article(key: string): string | undefined;
}

export interface MarkdownProblem {
  line: number;
  message: string;
}

export interface MarkdownResult {
  doc: TipTapNode;
  problems: MarkdownProblem[];
  /** Keys referenced, for link checks and for the loader's ordering. */
  drawings: string[];
  articles: string[];
}

type Mark = NonNullable<TipTapNode['marks']>[number];

const text = (value: string, marks: Mark[] = []): TipTapNode => (marks.length ? { type: 'text', text: value, marks: [...marks] } : { type: 'text', text: value });

interface InlineContext {
  line: number;
  resolver: MarkdownResolver;
  problems: MarkdownProblem[];
  articles: Set<string>;
}

/** Inline text: **bold**, *italic*, `code` and [links](href), nested one level (bold inside a link). */
function inline(source: string, ctx: InlineContext, marks: Mark[] = []): TipTapNode[] {
  const out: TipTapNode[] = [];
  let buffer = '';
  const flush = () => {
    if (buffer) out.push(text(buffer, marks));
    buffer = '';
  };
  let i = 0;
  while (i < source.length) {
    const rest = source.slice(i);
    let m: RegExpExecArray | null;
    if ((m = /^`([^`]+)`/.exec(rest))) {
      flush();
      out.push(text(m[1], [...marks, { type: 'code' }]));
      i += m[0].length;
    } else if ((m = /^\*\*(.+?)\*\*/.exec(rest))) {
      flush();
      out.push(...inline(m[1], ctx, [...marks, { type: 'bold' }]));
      i += m[0].length;
    } else if ((m = /^\*([^*\s][^*]*?)\*/.exec(rest))) {
      flush();
      out.push(...inline(m[1], ctx, [...marks, { type: 'italic' }]));
      i += m[0].length;
    } else if ((m = /^\[([^\]]+)\]\(([^)\s]+)\)/.exec(rest))) {
      flush();
      let href: string | undefined = m[2];
      const ref = /^article:([a-z0-9-]+)$/.exec(m[2]);
      if (ref) {
        ctx.articles.add(ref[1]);
        href = ctx.resolver.article(ref[1]);
        if (!href) ctx.problems.push({ line: ctx.line, message: `Link to unknown article '${ref[1]}'` });
      } else if (!/^(https?:\/\/|mailto:|\/(?!\/))/.test(m[2])) {
        ctx.problems.push({ line: ctx.line, message: `Link '${m[2]}' is neither article:KEY nor a safe address` });
        href = undefined;
      }
      out.push(...inline(m[1], ctx, href ? [...marks, { type: 'link', attrs: { href } }] : marks));
      i += m[0].length;
    } else {
      buffer += source[i];
      i += 1;
    }
  }
  flush();
  return out;
}

const paragraph = (content: TipTapNode[]): TipTapNode => (content.length ? { type: 'paragraph', content } : { type: 'paragraph' });

function splitRow(line: string): string[] {
  return line
    .trim()
    .replace(/^\|/, '')
    .replace(/\|$/, '')
    .split('|')
    .map((cell) => cell.trim());
}

/** Converts an article body (front matter already removed) to a TipTap document. */
export function markdownToDoc(source: string, resolver: MarkdownResolver, firstLine = 1): MarkdownResult {
  const lines = source.replace(/\r\n/g, '\n').split('\n');
  const problems: MarkdownProblem[] = [];
  const drawings = new Set<string>();
  const articles = new Set<string>();
  const ctxAt = (index: number): InlineContext => ({ line: index + firstLine, resolver, problems, articles });

  function blocks(from: number, to: number): TipTapNode[] {
    const out: TipTapNode[] = [];
    let i = from;
    while (i < to) {
      const line = lines[i];
      const trimmed = line.trim();
      if (trimmed === '') {
        i += 1;
        continue;
      }
      let m: RegExpExecArray | null;
      if ((m = /^:::caution\s+([a-z-]+)\s*$/.exec(trimmed))) {
        const hazard = m[1];
        if (!(HAZARD_KEYS as string[]).includes(hazard)) problems.push({ line: i + firstLine, message: `Unknown hazard '${hazard}': use ${HAZARD_KEYS.join(', ')}` });
        let end = i + 1;
        while (end < to && lines[end].trim() !== ':::') end += 1;
        if (end >= to) problems.push({ line: i + firstLine, message: 'Caution block is not closed with :::' });
        const inner = blocks(i + 1, Math.min(end, to));
        if (!inner.length) problems.push({ line: i + firstLine, message: 'Caution block is empty' });
        out.push({ type: 'caution', attrs: { hazard }, content: inner.length ? inner : [paragraph([])] });
        i = end + 1;
      } else if ((m = /^(#{2,3})\s+(.+)$/.exec(trimmed))) {
        out.push({ type: 'heading', attrs: { level: m[1].length }, content: inline(m[2], ctxAt(i)) });
        i += 1;
      } else if (/^#\s/.test(trimmed) || /^#{4,}/.test(trimmed)) {
        problems.push({ line: i + firstLine, message: 'Only ## and ### headings are allowed (the title is the article title)' });
        i += 1;
      } else if (/^(-{3,}|\*{3,})$/.test(trimmed)) {
        out.push({ type: 'horizontalRule' });
        i += 1;
      } else if ((m = /^!\[([^\]]*)\]\(drawing:([a-z0-9-]+)\)$/.exec(trimmed))) {
        drawings.add(m[2]);
        const src = resolver.drawing(m[2]);
        if (!src) problems.push({ line: i + firstLine, message: `Unknown drawing '${m[2]}'` });
        if (!m[1].trim()) problems.push({ line: i + firstLine, message: 'A drawing needs alt text that says what it shows' });
        if (src) out.push({ type: 'image', attrs: { src, alt: m[1].trim() } });
        i += 1;
      } else if (trimmed.startsWith('![')) {
        problems.push({ line: i + firstLine, message: 'Images must be drawings of our own: ![alt](drawing:KEY) on a line of their own' });
        i += 1;
      } else if (trimmed.startsWith('```')) {
        let end = i + 1;
        while (end < to && !lines[end].trim().startsWith('```')) end += 1;
        const code = lines.slice(i + 1, end).join('\n');
        out.push({ type: 'codeBlock', content: code ? [text(code)] : [] });
        i = end + 1;
      } else if (trimmed.startsWith('>')) {
        const quoted: string[] = [];
        while (i < to && lines[i].trim().startsWith('>')) {
          quoted.push(lines[i].trim().replace(/^>\s?/, ''));
          i += 1;
        }
        out.push({ type: 'blockquote', content: [paragraph(inline(quoted.join(' '), ctxAt(i - 1)))] });
      } else if (trimmed.startsWith('|')) {
        const rows: { cells: string[]; line: number }[] = [];
        while (i < to && lines[i].trim().startsWith('|')) {
          rows.push({ cells: splitRow(lines[i]), line: i });
          i += 1;
        }
        const separator = rows[1] && rows[1].cells.every((cell) => /^:?-{3,}:?$/.test(cell));
        if (!separator) problems.push({ line: rows[0].line + firstLine, message: 'A table needs a header row and a |---| separator row' });
        const width = rows[0].cells.length;
        const body = rows.filter((_, index) => index !== 1 || !separator);
        out.push({
          type: 'table',
          content: body.map((row, index) => {
            if (row.cells.length !== width) problems.push({ line: row.line + firstLine, message: `Table row has ${row.cells.length} cells, the header has ${width}` });
            return {
              type: 'tableRow',
              content: row.cells.map((cell) => ({
                type: index === 0 && separator ? 'tableHeader' : 'tableCell',
                content: [paragraph(inline(cell, ctxAt(row.line)))],
              })),
            };
          }),
        });
      } else if (/^(-|\d+\.)\s+/.test(trimmed)) {
        const ordered = /^\d+\./.test(trimmed);
        const items: TipTapNode[] = [];
        while (i < to) {
          const current = lines[i].trim();
          const item = ordered ? /^\d+\.\s+(.*)$/.exec(current) : /^-\s+(.*)$/.exec(current);
          if (!item) break;
          // Continuation lines (indented, not a new item) belong to the item.
          let body = item[1];
          let next = i + 1;
          while (next < to && /^\s{2,}\S/.test(lines[next]) && !/^\s*(-|\d+\.)\s+/.test(lines[next])) {
            body += ` ${lines[next].trim()}`;
            next += 1;
          }
          items.push({ type: 'listItem', content: [paragraph(inline(body, ctxAt(i)))] });
          i = next;
        }
        out.push(ordered ? { type: 'orderedList', attrs: { start: 1 }, content: items } : { type: 'bulletList', content: items });
      } else {
        const parts: string[] = [];
        while (i < to) {
          const current = lines[i].trim();
          if (current === '' || /^(#{1,6}\s|:::|\||>|```|!\[|(-|\d+\.)\s)/.test(current) || /^(-{3,}|\*{3,})$/.test(current)) break;
          parts.push(current);
          i += 1;
        }
        out.push(paragraph(inline(parts.join(' '), ctxAt(i - 1))));
      }
    }
    return out;
  }

  const content = blocks(0, lines.length);
  return { doc: { type: 'doc', content }, problems, drawings: [...drawings], articles: [...articles] };
}

export interface FrontMatter {
  fields: Record<string, string | string[]>;
  body: string;
  /** Line number (1-based) of the body's first line in the file. */
  bodyLine: number;
}

/** Reads a `---` front matter of `key: value` and `key: [a, b]` lines. */
export function splitFrontMatter(source: string): FrontMatter | { error: string } {
  const lines = source.replace(/\r\n/g, '\n').split('\n');
  if (lines[0] !== '---') return { error: 'The file must start with a --- front matter block' };
  const end = lines.indexOf('---', 1);
  if (end < 0) return { error: 'The front matter is not closed with ---' };
  const fields: Record<string, string | string[]> = {};
  for (const line of lines.slice(1, end)) {
    if (!line.trim()) continue;
    const m = /^([a-zA-Z]+):\s*(.*)$/.exec(line);
    if (!m) return { error: `Front matter line not understood: ${line}` };
    // A value in double quotes may hold a colon: title: "Needle and seat: how it shuts off".
    const value = m[2].trim().replace(/^"(.*)"$/, '$1');
    const list = /^\[(.*)\]$/.exec(value);
    fields[m[1]] = list
      ? list[1]
          .split(',')
          .map((s) => s.trim())
          .filter(Boolean)
      : value;
  }
  return { fields, body: lines.slice(end + 1).join('\n'), bodyLine: end + 2 };
}
