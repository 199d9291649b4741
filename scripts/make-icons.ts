// Draws the installed web app's icons (public/icons) from one original SVG: a balance ring with
// a heavy spot on a dark tile. Run with `npx tsx scripts/make-icons.ts` after changing the drawing.
import { mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";
import sharp from "sharp";

const OUT = path.join(process.cwd(), "public", "icons");

/** `padding` leaves the safe zone a maskable icon needs (the launcher may cut a circle). */
function drawing(padding: number): string {
  const s = 512;
  const r = (s / 2 - padding) * 0.62;
  const c = s / 2;
  return `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${s} ${s}">
<rect width="${s}" height="${s}" rx="${padding ? 0 : 96}" fill="#262a31"/>
<circle cx="${c}" cy="${c}" r="${r}" fill="none" stroke="#dcc17a" stroke-width="${r * 0.26}"/>
<path d="M${c} ${c - r}V${c + r}" stroke="#dcc17a" stroke-width="${r * 0.26}"/>
<circle cx="${c}" cy="${c + r * 0.55}" r="${r * 0.32}" fill="#dcc17a"/>
</svg>`;
}

mkdirSync(OUT, { recursive: true });
writeFileSync(path.join(OUT, "icon.svg"), drawing(0));
for (const size of [192, 512]) {
  await sharp(Buffer.from(drawing(0)))
    .resize(size, size)
    .png()
    .toFile(path.join(OUT, `icon-${size}.png`));
  await sharp(Buffer.from(drawing(64)))
    .resize(size, size)
    .png()
    .toFile(path.join(OUT, `maskable-${size}.png`));
}
console.log(`icons written to ${OUT}`);
