// Writes docs/guide-format.schema.json from the guide file's zod schema, so the documented format
// cannot drift from what import accepts. Run: node --import tsx scripts/guide-schema.ts
import { writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { guideFileJsonSchema } from '../src/shared/guides/export';

const target = fileURLToPath(new URL('../docs/guide-format.schema.json', import.meta.url));
writeFileSync(target, `${JSON.stringify(guideFileJsonSchema(), null, 2)}\n`);
console.log(`Wrote ${target}`);
