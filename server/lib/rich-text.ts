// Rich text on the server: the TipTap JSON a client sends is cleaned node by node, rendered to
// HTML with the same extensions the editor uses, and the HTML is sanitised again with DOMPurify
// over jsdom. Clients only ever display this sanitised HTML.
import createDOMPurify from 'dompurify';
import { JSDOM } from 'jsdom';
import { renderToHTMLString } from '@tiptap/static-renderer/pm/html-string';
import { FILE_SRC, SAFE_HREF, isHazard, richTextExtensions, type TipTapNode } from '../../src/shared/rich-text/extensions';
import { AppError } from './app-error';

const NODE_TYPES = new Set([
  'doc',
  'paragraph',
  'text',
  'heading',
  'bulletList',
  'orderedList',
  'listItem',
  'blockquote',
  'codeBlock',
  'horizontalRule',
  'hardBreak',
  'image',
  'table',
  'tableRow',
  'tableHeader',
  'tableCell',
  'caution',
]);
const MARK_TYPES = new Set(['bold', 'italic', 'strike', 'code', 'link', 'underline']);

const window = new JSDOM('').window;
const purify = createDOMPurify(window as unknown as Parameters<typeof createDOMPurify>[0]);

const ALLOWED_TAGS = [
  'p',
  'br',
  'strong',
  'em',
  's',
  'u',
  'code',
  'pre',
  'a',
  'h2',
  'h3',
  'ul',
  'ol',
  'li',
  'blockquote',
  'hr',
  'img',
  'table',
  'tbody',
  'thead',
  'tr',
  'th',
  'td',
  'colgroup',
  'col',
  'aside',
  'div',
];
const ALLOWED_ATTR = ['href', 'target', 'rel', 'src', 'alt', 'title', 'colspan', 'rowspan', 'class', 'data-caution', 'role', 'aria-label', 'start'];

purify.addHook('uponSanitizeAttribute', (node, data) => {
  if (data.attrName.startsWith('data-') && !(data.attrName === 'data-caution' && node.nodeName === 'ASIDE')) data.keepAttr = false;
  if (data.attrName === 'src' && !(node.nodeName === 'IMG' && FILE_SRC.test(data.attrValue))) data.keepAttr = false;
  if (data.attrName === 'href' && !SAFE_HREF.test(data.attrValue)) data.keepAttr = false;
  if (data.attrName === 'class' && !/^(caution|caution-hazard|caution-body|tableWrapper)$/.test(data.attrValue)) data.keepAttr = false;
});
purify.addHook('afterSanitizeAttributes', (node) => {
  if (node.nodeName === 'A') {
    node.setAttribute('target', '_blank');
    node.setAttribute('rel', 'noopener noreferrer nofollow');
  }
  // An image whose source was refused is dropped rather than shown broken.
  if (node.nodeName === 'IMG' && !node.getAttribute('src')) node.remove();
});

export function sanitizeHtml(html: string): string {
  return purify.sanitize(html, {
    ALLOWED_TAGS,
    ALLOWED_ATTR,
    // data-* is allowed here only so data-caution survives; the hook drops every other one.
    ALLOW_DATA_ATTR: true,
    ALLOWED_URI_REGEXP: /^(?:https?:|mailto:|\/(?!\/))/i,
    FORBID_TAGS: ['style', 'script', 'iframe', 'object', 'embed', 'form', 'svg', 'math'],
  });
}

export const MAX_DOC_BYTES = 500_000;
const MAX_DEPTH = 40;

/** Keeps only known nodes, marks and safe attributes; collects the files the document uses. */
export function cleanDoc(input: unknown, field = 'body'): { doc: TipTapNode; fileIds: string[]; hazards: string[] } {
  if (JSON.stringify(input ?? null).length > MAX_DOC_BYTES) {
    throw AppError.invalid(`The text is too long (over ${MAX_DOC_BYTES / 1000} kB)`, { [field]: 'The text is too long; split it into several articles' });
  }
  const fileIds = new Set<string>();
  const hazards = new Set<string>();
  function clean(node: unknown, depth: number): TipTapNode | null {
    if (depth > MAX_DEPTH) throw AppError.invalid('The text is nested too deeply', { [field]: 'The text is nested too deeply' });
    if (!node || typeof node !== 'object') return null;
    const n = node as TipTapNode;
    if (typeof n.type !== 'string' || !NODE_TYPES.has(n.type)) return null;
    const out: TipTapNode = { type: n.type };
    if (n.type === 'text') {
      if (typeof n.text !== 'string' || n.text === '') return null;
      out.text = n.text;
      const marks = (Array.isArray(n.marks) ? n.marks : [])
        .filter((m) => m && MARK_TYPES.has(m.type))
        .map((m) => {
          if (m.type !== 'link') return { type: m.type };
          const href = typeof m.attrs?.href === 'string' && SAFE_HREF.test(m.attrs.href) ? m.attrs.href : null;
          return href ? { type: 'link', attrs: { href } } : null;
        })
        .filter((m): m is NonNullable<typeof m> => m !== null);
      if (marks.length) out.marks = marks;
      return out;
    }
    const attrs: Record<string, unknown> = {};
    if (n.type === 'heading') attrs.level = n.attrs?.level === 3 ? 3 : 2;
    if (n.type === 'orderedList' && Number.isInteger(n.attrs?.start)) attrs.start = n.attrs!.start;
    if (n.type === 'image') {
      const src = typeof n.attrs?.src === 'string' ? n.attrs.src : '';
      const m = FILE_SRC.exec(src);
      if (!m) return null;
      fileIds.add(m[1]);
      attrs.src = src;
      attrs.alt = typeof n.attrs?.alt === 'string' ? n.attrs.alt.slice(0, 300) : '';
      if (typeof n.attrs?.title === 'string') attrs.title = n.attrs.title.slice(0, 300);
    }
    if (n.type === 'tableCell' || n.type === 'tableHeader') {
      for (const k of ['colspan', 'rowspan'] as const) {
        const v = n.attrs?.[k];
        if (Number.isInteger(v) && (v as number) > 1 && (v as number) < 50) attrs[k] = v;
      }
    }
    if (n.type === 'caution') {
      attrs.hazard = isHazard(n.attrs?.hazard) ? n.attrs!.hazard : 'mechanical';
      hazards.add(attrs.hazard as string);
    }
    if (Object.keys(attrs).length) out.attrs = attrs;
    if (Array.isArray(n.content)) {
      const children = n.content.map((c) => clean(c, depth + 1)).filter((c): c is TipTapNode => c !== null);
      if (children.length) out.content = children;
    }
    return out;
  }
  const doc = clean(input, 0);
  if (!doc || doc.type !== 'doc') throw AppError.invalid('The text is not in the editor\u2019s format', { [field]: 'The text is not in the editor\u2019s format' });
  if (!doc.content?.length) doc.content = [{ type: 'paragraph' }];
  return { doc, fileIds: [...fileIds], hazards: [...hazards] };
}

export function renderDoc(doc: TipTapNode): string {
  let html: string;
  try {
    html = renderToHTMLString({ extensions: richTextExtensions(), content: doc as never });
  } catch {
    throw AppError.invalid('The text could not be read; reload the editor and try again', { body: 'The text could not be read' });
  }
  return sanitizeHtml(html);
}

/** Plain text with paragraph breaks, for comparing revisions and for search. */
export function docText(doc: TipTapNode): string {
  const blocks: string[] = [];
  function walk(n: TipTapNode, into: string[]) {
    if (n.type === 'text') {
      into.push(n.text ?? '');
      return;
    }
    if (n.type === 'hardBreak') {
      into.push('\n');
      return;
    }
    if (n.type === 'image') {
      blocks.push(`[Photo: ${String(n.attrs?.alt ?? '')}]`);
      return;
    }
    const isBlock = ['paragraph', 'heading', 'codeBlock', 'tableCell', 'tableHeader'].includes(n.type);
    if (isBlock) {
      const parts: string[] = [];
      for (const c of n.content ?? []) walk(c, parts);
      const line = parts.join('').trim();
      if (line) blocks.push(n.type === 'heading' ? `## ${line}` : line);
      return;
    }
    if (n.type === 'caution') blocks.push(`[Caution: ${String(n.attrs?.hazard)}]`);
    for (const c of n.content ?? []) walk(c, into);
  }
  walk(doc, []);
  return blocks.join('\n');
}

export function prepareRichText(input: unknown, field = 'body') {
  const { doc, fileIds, hazards } = cleanDoc(input, field);
  return { doc, html: renderDoc(doc), text: docText(doc), fileIds, hazards };
}
