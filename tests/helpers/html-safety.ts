// Reads stored HTML the way a browser would and lists anything that could run script.
import { JSDOM } from 'jsdom';

const FORBIDDEN_TAGS = new Set(['SCRIPT', 'IFRAME', 'OBJECT', 'EMBED', 'STYLE', 'SVG', 'MATH', 'META', 'LINK', 'FORM', 'INPUT', 'BASE', 'BGSOUND', 'NOSCRIPT']);

export function dangers(html: string): string[] {
  const doc = new JSDOM(`<body>${html}</body>`).window.document;
  const found: string[] = [];
  for (const el of Array.from(doc.body.querySelectorAll('*'))) {
    if (FORBIDDEN_TAGS.has(el.tagName.toUpperCase())) found.push(`<${el.tagName.toLowerCase()}>`);
    for (const attr of Array.from(el.attributes)) {
      const name = attr.name.toLowerCase();
      const value = attr.value.replace(/[\s\u0000-\u001f]/g, '').toLowerCase();
      if (name.startsWith('on')) found.push(`${el.tagName.toLowerCase()}[${name}]`);
      if (name === 'style' || name === 'background' || name === 'dynsrc' || name === 'action') found.push(`${el.tagName.toLowerCase()}[${name}]`);
      if ((name === 'href' || name === 'src') && !/^(https?:|mailto:|\/[^/])/.test(value)) found.push(`${el.tagName.toLowerCase()}[${name}=${attr.value}]`);
    }
  }
  return found;
}
