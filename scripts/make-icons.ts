// Draws the installable-app icons (192 and 512 px PNG) from public/icon.svg. The artwork keeps
// its mark inside the central 80 % so launchers that crop icons to a circle ("maskable") lose
// nothing. Run after changing the SVG: node --import tsx scripts/make-icons.ts
import { readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import sharp from 'sharp';

const pub = join(resolve(import.meta.dirname, '..'), 'public');
const svg = readFileSync(join(pub, 'icon.svg'));
for (const size of [192, 512]) {
  const out = join(pub, `icon-${size}.png`);
  await sharp(svg, { density: Math.ceil((72 * size) / 512) * 2 })
    .resize(size, size)
    .png({ compressionLevel: 9 })
    .toFile(out);
  console.log(`wrote ${out}`);
}
