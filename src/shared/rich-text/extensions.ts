// The rich-text vocabulary of articles and guide steps: TipTap's starter kit, images we serve,
// tables, and Beadpath's caution block. The editor and the server renderer use the same list, so
// what an author sees is what readers get.
import { Node, mergeAttributes, type Extensions } from '@tiptap/core';
import Image from '@tiptap/extension-image';
import { TableKit } from '@tiptap/extension-table';
import StarterKit from '@tiptap/starter-kit';
import { HAZARDS, HAZARD_KEYS, type Hazard } from '../tags';

/** Only files Beadpath itself serves may appear as images. */
export const FILE_SRC = /^\/api\/files\/([0-9a-f-]{36})\/(display|thumb|large)$/;
export const SAFE_HREF = /^(https?:\/\/|mailto:|\/(?!\/))/i;

export function isHazard(value: unknown): value is Hazard {
  return typeof value === 'string' && (HAZARD_KEYS as string[]).includes(value);
}

declare module '@tiptap/core' {
  interface Commands<ReturnType> {
    caution: {
      /** Wraps the selection in a caution block for the given hazard. */
      setCaution: (hazard: Hazard) => ReturnType;
    };
  }
}

export const Caution = Node.create({
  name: 'caution',
  group: 'block',
  content: 'block+',
  defining: true,
  addAttributes() {
    return {
      hazard: {
        default: 'mechanical',
        parseHTML: (el) => {
          const v = el.getAttribute('data-caution');
          return isHazard(v) ? v : 'mechanical';
        },
        renderHTML: (attrs) => ({ 'data-caution': isHazard(attrs.hazard) ? attrs.hazard : 'mechanical' }),
      },
    };
  },
  parseHTML() {
    return [{ tag: 'aside[data-caution]', contentElement: 'div.caution-body' }];
  },
  renderHTML({ node, HTMLAttributes }) {
    const hazard: Hazard = isHazard(node.attrs.hazard) ? node.attrs.hazard : 'mechanical';
    return [
      'aside',
      mergeAttributes(HTMLAttributes, { 'data-caution': hazard, class: 'caution', role: 'note', 'aria-label': `Caution: ${HAZARDS[hazard]}` }),
      ['p', { class: 'caution-hazard', contenteditable: 'false' }, `Caution: ${HAZARDS[hazard]}`],
      ['div', { class: 'caution-body' }, 0],
    ];
  },
  addCommands() {
    return {
      setCaution:
        (hazard) =>
        ({ commands }) =>
          commands.wrapIn(this.name, { hazard }),
    };
  },
});

export function richTextExtensions(): Extensions {
  return [
    StarterKit.configure({
      heading: { levels: [2, 3] },
      link: { openOnClick: false, autolink: true, protocols: ['http', 'https', 'mailto'], defaultProtocol: 'https' },
    }),
    Image.configure({ inline: false, allowBase64: false }),
    TableKit.configure({ table: { resizable: false } }),
    Caution,
  ];
}

export interface TipTapNode {
  type: string;
  attrs?: Record<string, unknown>;
  content?: TipTapNode[];
  marks?: { type: string; attrs?: Record<string, unknown> }[];
  text?: string;
}

export const EMPTY_DOC: TipTapNode = { type: 'doc', content: [{ type: 'paragraph' }] };
