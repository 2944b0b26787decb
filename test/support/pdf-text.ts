/** Text of a PDF, extracted with pdf-parse (a general-purpose PDF library), whitespace collapsed. */
// eslint-disable-next-line @typescript-eslint/no-require-imports
const { PDFParse } = require('pdf-parse') as {
  PDFParse: new (o: { data: Uint8Array }) => { getText(): Promise<{ text: string; total: number; pages: { num: number; text: string }[] }>; destroy(): Promise<void> };
};

/** The whole text, the page count and each page's own text (whitespace collapsed). */
export async function pdfText(pdf: Buffer): Promise<{ text: string; pages: number; pageTexts: string[] }> {
  const parser = new PDFParse({ data: new Uint8Array(pdf) });
  try {
    const result = await parser.getText();
    return { text: result.text.replace(/\s+/g, ' '), pages: result.total, pageTexts: result.pages.map((p) => p.text.replace(/\s+/g, ' ').trim()) };
  } finally {
    await parser.destroy();
  }
}
