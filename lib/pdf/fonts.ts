import { readFileSync } from "node:fs";
import path from "node:path";
import { Font } from "@react-pdf/renderer";

/** Family names to use in PDF styles once `registerPdfFonts()` has run. */
export const PDF_FONTS = { sans: "Plex Sans", mono: "Plex Mono" } as const;

/** The shipped TTFs (SIL OFL, fonts/OFL.txt); the pages load the same files (app/fonts.ts). */
export function pdfFontPath(file: string): string {
  return path.join(process.cwd(), "fonts", file);
}

/**
 * The PDF renderer's font reader reads a few bytes past the last glyph of Plex Mono, where the
 * space glyphs sit, and throws on any text with a space. Zero bytes after the file's end (in
 * memory only; the shipped file is unchanged) give it room; browsers never read them.
 */
function paddedFontDataUrl(file: string): string {
  const bytes = Buffer.concat([readFileSync(pdfFontPath(file)), Buffer.alloc(64)]);
  return `data:font/ttf;base64,${bytes.toString("base64")}`;
}

const holder = globalThis as unknown as { counterpoisePdfFonts?: boolean };

/**
 * Registers IBM Plex Sans (400, 400 italic, 600, 700) and Plex Mono (500) with the PDF renderer.
 * Safe to call before every render: it registers once per process.
 */
export function registerPdfFonts(): void {
  if (holder.counterpoisePdfFonts) return;
  Font.register({
    family: PDF_FONTS.sans,
    fonts: [
      { src: pdfFontPath("IBMPlexSans_400Regular.ttf"), fontWeight: 400 },
      {
        src: pdfFontPath("IBMPlexSans_400Regular_Italic.ttf"),
        fontWeight: 400,
        fontStyle: "italic",
      },
      { src: pdfFontPath("IBMPlexSans_600SemiBold.ttf"), fontWeight: 600 },
      { src: pdfFontPath("IBMPlexSans_700Bold.ttf"), fontWeight: 700 },
    ],
  });
  Font.register({
    family: PDF_FONTS.mono,
    fonts: [{ src: paddedFontDataUrl("IBMPlexMono_500Medium.ttf"), fontWeight: 500 }],
  });
  // Part numbers and codes must not be split with hyphens.
  Font.registerHyphenationCallback((word) => [word]);
  holder.counterpoisePdfFonts = true;
}
