// The frame every Beadpath message shares: the organisation's name on top, plain HTML with inline
// styles that mail programs keep, and a plain-text twin built from the same blocks.

export interface MailContent {
  subject: string;
  text: string;
  html: string;
}

export function esc(value: string): string {
  return value.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

/** One piece of a message, written once for both parts. */
export type Block =
  | { kind: 'p'; text: string }
  | { kind: 'heading'; text: string }
  | { kind: 'button'; label: string; href: string }
  | { kind: 'list'; items: string[]; ordered?: boolean }
  | { kind: 'caution'; title: string; items: string[] }
  | { kind: 'pre'; text: string }
  | { kind: 'small'; text: string };

const INK = '#24211C';
const SOFT = '#57503F';
const AMBER = '#9C5700';
const DANGER = '#B3261E';
const PAPER = '#FBF8F1';
const RULE = '#D8CFBF';

function blockHtml(b: Block): string {
  switch (b.kind) {
    case 'p':
      return `<p style="margin:0 0 14px;line-height:1.5">${esc(b.text).replace(/\n/g, '<br>')}</p>`;
    case 'heading':
      return `<h2 style="margin:22px 0 8px;font-family:Georgia,serif;font-size:18px;color:${INK}">${esc(b.text)}</h2>`;
    case 'button':
      return `<p style="margin:18px 0"><a href="${esc(b.href)}" style="display:inline-block;background:${AMBER};color:#ffffff;text-decoration:none;font-weight:bold;padding:12px 20px;border-radius:6px">${esc(b.label)}</a></p><p style="margin:0 0 14px;font-size:13px;color:${SOFT}">Or open this address: <a href="${esc(b.href)}" style="color:${AMBER}">${esc(b.href)}</a></p>`;
    case 'list': {
      const tag = b.ordered ? 'ol' : 'ul';
      return `<${tag} style="margin:0 0 14px;padding-left:22px;line-height:1.5">${b.items.map((i) => `<li style="margin:0 0 4px">${esc(i)}</li>`).join('')}</${tag}>`;
    }
    case 'caution':
      return `<div style="margin:0 0 14px;border-left:4px solid ${DANGER};background:#FBE4E1;padding:10px 14px"><p style="margin:0 0 6px;font-weight:bold;color:#8C1D17">${esc(b.title)}</p><ul style="margin:0;padding-left:20px;line-height:1.5">${b.items.map((i) => `<li>${esc(i)}</li>`).join('')}</ul></div>`;
    case 'pre':
      return `<pre style="margin:0 0 14px;white-space:pre-wrap;font-family:Consolas,Menlo,monospace;font-size:13px;background:#F2ECE0;padding:10px;border-radius:4px">${esc(b.text)}</pre>`;
    case 'small':
      return `<p style="margin:0 0 10px;font-size:13px;color:${SOFT}">${esc(b.text)}</p>`;
  }
}

function blockText(b: Block): string {
  switch (b.kind) {
    case 'p':
    case 'small':
      return b.text;
    case 'heading':
      return `${b.text}\n${'-'.repeat(Math.min(b.text.length, 60))}`;
    case 'button':
      return `${b.label}:\n${b.href}`;
    case 'list':
      return b.items.map((i, n) => (b.ordered ? `${n + 1}. ${i}` : `- ${i}`)).join('\n');
    case 'caution':
      return [`! ${b.title}`, ...b.items.map((i) => `  - ${i}`)].join('\n');
    case 'pre':
      return b.text;
  }
}

export function render(input: { subject: string; organisationName: string; preheader?: string; blocks: Block[]; footer: string }): MailContent {
  const body = input.blocks.map(blockHtml).join('\n');
  const html = `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width"><title>${esc(input.subject)}</title></head>
<body style="margin:0;padding:0;background:${PAPER};color:${INK};font-family:system-ui,-apple-system,'Segoe UI',Roboto,Arial,sans-serif;font-size:16px">
${input.preheader ? `<div style="display:none;max-height:0;overflow:hidden">${esc(input.preheader)}</div>` : ''}
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="background:${PAPER}"><tr><td align="center" style="padding:24px 12px">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="max-width:600px;background:#FFFDF9;border:1px solid ${RULE};border-radius:8px">
<tr><td style="padding:16px 24px;border-bottom:1px solid ${RULE};font-family:Georgia,serif;font-size:18px;font-weight:bold">${esc(input.organisationName)}</td></tr>
<tr><td style="padding:20px 24px">
${body}
</td></tr>
<tr><td style="padding:14px 24px;border-top:1px solid ${RULE};font-size:12px;color:${SOFT}">${esc(input.footer)}</td></tr>
</table></td></tr></table>
</body></html>`;
  const text = [input.organisationName, '='.repeat(Math.min(input.organisationName.length, 60)), '', input.blocks.map(blockText).join('\n\n'), '', '--', input.footer, ''].join('\n');
  return { subject: input.subject, text, html };
}
