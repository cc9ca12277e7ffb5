// Reads a PDF's text with pdf.js (the Node "legacy" build): how the tests check what a report says.
import { createRequire } from "node:module";
import { dirname, join } from "node:path";
import { getDocument } from "pdfjs-dist/legacy/build/pdf.mjs";

const standardFontDataUrl = join(dirname(createRequire(import.meta.url).resolve("pdfjs-dist/package.json")), "standard_fonts") + "/";

export interface PdfText {
  pages: number;
  /** All pages' text, items joined by spaces, pages by newlines. */
  text: string;
  title: string | null;
}

export async function pdfText(bytes: Uint8Array): Promise<PdfText> {
  const doc = await getDocument({ data: new Uint8Array(bytes), useSystemFonts: false, standardFontDataUrl }).promise;
  try {
    const pages: string[] = [];
    for (let p = 1; p <= doc.numPages; p++) {
      const content = await (await doc.getPage(p)).getTextContent();
      pages.push(content.items.map((i) => ("str" in i ? i.str : "")).join(" "));
    }
    const meta = await doc.getMetadata();
    const title = (meta.info as { Title?: string } | undefined)?.Title ?? null;
    return { pages: doc.numPages, text: pages.join("\n").replace(/\s+/g, " "), title };
  } finally {
    await doc.destroy();
  }
}
