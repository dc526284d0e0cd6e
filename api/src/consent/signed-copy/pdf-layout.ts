/**
 * A small text layout for pdf-lib: greedy word wrapping over runs of regular and bold text, page breaks, and
 * footers drawn once the page count is known.
 */
import { PDFDocument, PDFFont, PDFPage, rgb } from 'pdf-lib';
import type { TextRun } from '../consent-markdown';

export const PAGE_SIZE: [number, number] = [612, 792]; // US Letter, in points
export const MARGIN = { top: 64, bottom: 72, left: 64, right: 64 };
export const INK = rgb(0.1, 0.1, 0.12);
export const MUTED = rgb(0.38, 0.38, 0.42);
export const RULE = rgb(0.78, 0.78, 0.8);

export interface LayoutFonts {
  regular: PDFFont;
  bold: PDFFont;
}

interface Piece {
  text: string;
  bold: boolean;
  /** Sum of the measured widths of the words and spaces in it. */
  width: number;
}
type Line = Piece[];

export interface TextStyle {
  size: number;
  lineHeight: number;
  color?: ReturnType<typeof rgb>;
  /** Makes every run bold. */
  bold?: boolean;
}

export class PdfWriter {
  page: PDFPage;
  y: number;
  readonly pages: PDFPage[] = [];

  constructor(
    readonly doc: PDFDocument,
    readonly fonts: LayoutFonts,
  ) {
    this.page = this.newPage();
    this.y = this.top;
  }

  get top(): number {
    return PAGE_SIZE[1] - MARGIN.top;
  }

  get width(): number {
    return PAGE_SIZE[0] - MARGIN.left - MARGIN.right;
  }

  newPage(): PDFPage {
    this.page = this.doc.addPage(PAGE_SIZE);
    this.pages.push(this.page);
    this.y = this.top;
    return this.page;
  }

  /** Starts a new page unless `height` points still fit above the bottom margin. */
  ensure(height: number): void {
    if (this.y - height < MARGIN.bottom) this.newPage();
  }

  font(bold: boolean): PDFFont {
    return bold ? this.fonts.bold : this.fonts.regular;
  }

  // Measuring through fontkit costs a text layout per call; words repeat, so widths are cached per font.
  private readonly unitWidths = new Map<string, number>();

  measure(text: string, bold: boolean, size: number): number {
    const key = `${bold ? 'b' : 'r'}${text}`;
    let width = this.unitWidths.get(key);
    if (width === undefined) {
      width = this.font(bold).widthOfTextAtSize(text, 1000) / 1000;
      this.unitWidths.set(key, width);
    }
    return width * size;
  }

  /** Splits runs into lines no wider than `width`; a word wider than a line is broken between characters. */
  wrap(runs: TextRun[], width: number, style: TextStyle): Line[] {
    const lines: Line[] = [];
    let line: Line = [];
    let lineWidth = 0;
    const measure = (text: string, bold: boolean) => this.measure(text, bold, style.size);
    const pushPiece = (text: string, bold: boolean, width = measure(text, bold)) => {
      const last = line[line.length - 1];
      if (last && last.bold === bold) {
        last.text += text;
        last.width += width;
      } else {
        line.push({ text, bold, width });
      }
      lineWidth += width;
    };
    const breakLine = () => {
      const last = line[line.length - 1];
      if (last?.text.endsWith(' ')) {
        last.text = last.text.slice(0, -1);
        last.width -= measure(' ', last.bold);
      }
      lines.push(line.filter((p) => p.text !== ''));
      line = [];
      lineWidth = 0;
    };

    for (const run of runs) {
      const bold = style.bold === true || run.bold;
      const paragraphs = run.text.replace(/\t/g, ' ').split('\n');
      paragraphs.forEach((part, index) => {
        if (index > 0) breakLine();
        for (const token of part.match(/ +|[^ ]+/g) ?? []) {
          if (token.startsWith(' ')) {
            if (line.length > 0) pushPiece(' ', bold);
            continue;
          }
          const tokenWidth = measure(token, bold);
          if (lineWidth + tokenWidth <= width) {
            pushPiece(token, bold, tokenWidth);
            continue;
          }
          if (line.length > 0) breakLine();
          if (tokenWidth <= width) {
            pushPiece(token, bold, tokenWidth);
            continue;
          }
          let chunk = '';
          for (const char of token) {
            if (chunk && measure(chunk + char, bold) > width) {
              pushPiece(chunk, bold);
              breakLine();
              chunk = '';
            }
            chunk += char;
          }
          if (chunk) pushPiece(chunk, bold);
        }
      });
    }
    if (line.length > 0) breakLine();
    return lines;
  }

  /** Draws wrapped text at the current position, moving down; breaks pages between lines. */
  text(runs: TextRun[], style: TextStyle, x = MARGIN.left, width = this.width, firstLineMarker?: string): void {
    const lines = this.wrap(runs, width, style);
    lines.forEach((line, index) => {
      this.ensure(style.lineHeight);
      const baseline = this.y - style.size;
      if (index === 0 && firstLineMarker) {
        this.page.drawText(firstLineMarker, {
          x: x - 16,
          y: baseline,
          size: style.size,
          font: this.fonts.regular,
          color: style.color ?? INK,
        });
      }
      let cursor = x;
      for (const piece of line) {
        const font = this.font(piece.bold);
        this.page.drawText(piece.text, { x: cursor, y: baseline, size: style.size, font, color: style.color ?? INK });
        cursor += piece.width;
      }
      this.y -= style.lineHeight;
    });
  }

  /** Height the text would take, for keeping blocks together. */
  height(runs: TextRun[], style: TextStyle, width = this.width): number {
    return this.wrap(runs, width, style).length * style.lineHeight;
  }

  gap(points: number): void {
    this.y -= points;
  }

  rule(): void {
    this.ensure(12);
    this.y -= 6;
    this.page.drawLine({
      start: { x: MARGIN.left, y: this.y },
      end: { x: PAGE_SIZE[0] - MARGIN.right, y: this.y },
      thickness: 0.6,
      color: RULE,
    });
    this.y -= 6;
  }

  /** Footer on every page: a left label and "Page i of n". */
  footers(label: string): void {
    const size = 8;
    const total = this.pages.length;
    this.pages.forEach((page, index) => {
      const right = `Page ${index + 1} of ${total}`;
      const rightWidth = this.fonts.regular.widthOfTextAtSize(right, size);
      let left = label;
      const room = this.width - rightWidth - 16;
      while (left.length > 1 && this.fonts.regular.widthOfTextAtSize(left, size) > room) left = `${left.slice(0, -2)}…`;
      const y = MARGIN.bottom - 32;
      page.drawLine({
        start: { x: MARGIN.left, y: y + 12 },
        end: { x: PAGE_SIZE[0] - MARGIN.right, y: y + 12 },
        thickness: 0.5,
        color: RULE,
      });
      page.drawText(left, { x: MARGIN.left, y, size, font: this.fonts.regular, color: MUTED });
      page.drawText(right, {
        x: PAGE_SIZE[0] - MARGIN.right - rightWidth,
        y,
        size,
        font: this.fonts.regular,
        color: MUTED,
      });
    });
  }
}
