// svg-to-pdfkit ships no types; the test and bench projects compile this file without src-main's
// include list, so the declaration is referenced here.
// eslint-disable-next-line @typescript-eslint/triple-slash-reference
/// <reference path="./svg-to-pdfkit.d.ts" />
import PDFDocument from 'pdfkit';
import SVGtoPDF from 'svg-to-pdfkit';
import { FONT_BOLD, FONT_REGULAR, memoFonts } from './fonts.js';
import { ACCENT, RULE_SOFT, INK, INK_SOFT, RULE } from '../../shared-core/present/palette.js';

/**
 * A small flow-layout writer over pdfkit for the memo: A4 portrait, generous margins, one
 * family in two weights, tabular figures in tables, a running footer added once the page count
 * is known. It knows nothing about portfolios; the sections in render-memo.ts use it.
 */
export const PAGE = { width: 595.28, height: 841.89 } as const;
export const MARGIN = { left: 64, right: 64, top: 62, bottom: 74 } as const;
export const CONTENT_WIDTH = PAGE.width - MARGIN.left - MARGIN.right;

export const SIZE = { body: 9.5, small: 8, table: 8.5, h1: 15, h2: 11, title: 26 } as const;
const TNUM = ['tnum', 'lnum'] as const;
/** Room a row's colour swatch takes before its first cell. */
const SWATCH = 11;

export type Align = 'left' | 'right' | 'center';

export interface Column {
  header: string;
  /** Share of the table's width (relative weights). */
  width: number;
  align?: Align;
}

export interface TableRow {
  cells: readonly string[];
  /** Semibold, with a rule above: totals. */
  total?: boolean;
  /** Muted ink: lines that qualify the ones above (rounding residual). */
  muted?: boolean;
  /** A colour swatch before the first cell: the row is the key to a chart's colours. */
  swatch?: string;
}

export interface BulletItem {
  /** Printed in semibold before the text (an asset's name). */
  lead?: string;
  text: string;
}

export interface TableOptions {
  /** Figures in every column but the first use tabular numerals. */
  fontSize?: number;
}

interface PendingHeading {
  text: string;
  level: 1 | 2;
}

export interface PdfInfo {
  title: string;
  author: string;
  subject: string;
  keywords: string;
  /** Both the creation and the modification date: the memo's date, midnight UTC. */
  date: Date;
}

export class PageWriter {
  readonly doc: PDFKit.PDFDocument;
  private readonly chunks: Buffer[] = [];
  private readonly finished: Promise<void>;
  /** Headings not yet drawn: they are placed by the next block's `keep`, on that block's page. */
  private readonly pending: PendingHeading[] = [];

  constructor(info: PdfInfo) {
    this.doc = new PDFDocument({
      size: 'A4',
      margins: MARGIN,
      bufferPages: true,
      autoFirstPage: true,
      compress: true,
      pdfVersion: '1.7',
      displayTitle: true,
      lang: 'en-GB',
      info: {
        Title: info.title,
        Author: info.author,
        Subject: info.subject,
        Keywords: info.keywords,
        Creator: 'Holdfast',
        Producer: 'Holdfast memo writer (pdfkit)',
        CreationDate: info.date,
        ModDate: info.date,
      },
    });
    const fonts = memoFonts();
    this.doc.registerFont(FONT_REGULAR, fonts.regular);
    this.doc.registerFont(FONT_BOLD, fonts.bold);
    this.doc.on('data', (c: Buffer) => this.chunks.push(c));
    this.finished = new Promise((resolve, reject) => {
      this.doc.on('end', () => resolve());
      this.doc.on('error', reject);
    });
    this.doc.font(FONT_REGULAR).fontSize(SIZE.body).fillColor(INK);
  }

  get y(): number {
    return this.doc.y;
  }

  get bottom(): number {
    return PAGE.height - MARGIN.bottom;
  }

  newPage(): void {
    this.doc.addPage();
    this.doc.x = MARGIN.left;
    this.doc.y = MARGIN.top;
  }

  /**
   * Starts a new page unless `height` points fit below the cursor. Headings waiting to be drawn
   * (keep-with-next) count towards the height and are drawn first, so a heading always lands on
   * the page of what follows it. Every block calls this before it draws.
   */
  keep(height: number): void {
    const pending = this.pending.splice(0);
    const headings = pending.reduce((s, h) => s + this.headingHeight(h), 0);
    if (this.doc.y + headings + height > this.bottom && this.doc.y > MARGIN.top + 1) this.newPage();
    for (const h of pending) this.drawHeading(h);
  }

  space(points: number): void {
    this.doc.y += points;
  }

  /** A section heading with a thin accent rule, drawn with the block that follows it (keep-with-next). */
  heading(text: string): void {
    this.pending.push({ text, level: 1 });
  }

  /** A subheading, kept with the block that follows it as `heading` is. */
  subheading(text: string): void {
    this.pending.push({ text, level: 2 });
  }

  /** Starts the next heading on a fresh page (the appendix), unless the cursor is at a page's top. */
  pageBreak(): void {
    if (this.doc.y > MARGIN.top + 1 || this.pending.length > 0) {
      const pending = this.pending.splice(0);
      if (this.doc.y > MARGIN.top + 1) this.newPage();
      this.pending.push(...pending);
    }
  }

  private headingHeight(h: PendingHeading): number {
    const size = h.level === 1 ? SIZE.h1 : SIZE.h2;
    this.doc.font(FONT_BOLD).fontSize(size);
    const text = this.doc.heightOfString(h.text, { width: CONTENT_WIDTH });
    return h.level === 1 ? text + 13 : text + 7;
  }

  private drawHeading(h: PendingHeading): void {
    if (h.level === 1) {
      const y = this.doc.y;
      this.doc.font(FONT_BOLD).fontSize(SIZE.h1).fillColor(INK).text(h.text, MARGIN.left, y, { width: CONTENT_WIDTH });
      const ruleY = this.doc.y + 3;
      this.rule(ruleY, ACCENT, 0.8);
      this.doc.y = ruleY + 10;
    } else {
      this.space(4);
      this.doc.font(FONT_BOLD).fontSize(SIZE.h2).fillColor(INK).text(h.text, MARGIN.left, this.doc.y, {
        width: CONTENT_WIDTH,
      });
      this.space(3);
    }
    this.doc.font(FONT_REGULAR).fontSize(SIZE.body);
  }

  /** The height `paragraph` gives `text` at `size`, to keep a lead paragraph with what follows it. */
  paragraphHeight(text: string, size: number = SIZE.body): number {
    this.doc.font(FONT_REGULAR).fontSize(size);
    return this.doc.heightOfString(text, { width: CONTENT_WIDTH, lineGap: 2.2 }) + 6;
  }

  paragraph(text: string, options: { muted?: boolean; size?: number; bold?: boolean; after?: number } = {}): void {
    const size = options.size ?? SIZE.body;
    this.doc.font(options.bold ? FONT_BOLD : FONT_REGULAR).fontSize(size);
    const height = this.doc.heightOfString(text, { width: CONTENT_WIDTH, lineGap: 2.2 });
    // Short paragraphs stay whole; long ones may flow over a page break after their first lines.
    this.keep(height < 80 ? height : 3 * (size + 2.2));
    this.doc
      .font(options.bold ? FONT_BOLD : FONT_REGULAR)
      .fontSize(size)
      .fillColor(options.muted ? INK_SOFT : INK);
    this.doc.text(text, MARGIN.left, this.doc.y, { width: CONTENT_WIDTH, lineGap: 2.2, features: [...TNUM] });
    this.space(options.after ?? 6);
    this.doc.fillColor(INK).font(FONT_REGULAR).fontSize(SIZE.body);
  }

  /** A bulleted list; each item stays on one page. An item may lead with a few words in semibold. */
  bullets(items: readonly (string | BulletItem)[], options: { muted?: boolean } = {}): void {
    const indent = 11;
    const opts = { width: CONTENT_WIDTH - indent, lineGap: 2.2, features: [...TNUM] };
    for (const raw of items) {
      const item = typeof raw === 'string' ? { text: raw } : raw;
      const whole = item.lead ? `${item.lead} ${item.text}` : item.text;
      this.doc.font(FONT_REGULAR).fontSize(SIZE.body);
      const h = this.doc.heightOfString(whole, opts);
      this.keep(h + 3);
      const y = this.doc.y;
      this.doc.fillColor(ACCENT).text('\u2013', MARGIN.left, y, { width: indent, lineBreak: false });
      this.doc.fillColor(options.muted ? INK_SOFT : INK);
      if (item.lead) {
        this.doc.font(FONT_BOLD).text(`${item.lead} `, MARGIN.left + indent, y, { ...opts, continued: true });
        this.doc.font(FONT_REGULAR).text(item.text, opts);
      } else this.doc.text(item.text, MARGIN.left + indent, y, opts);
      this.space(3);
    }
    this.doc.fillColor(INK).font(FONT_REGULAR);
    this.space(3);
  }

  /** Label / value pairs in two columns (the cover, the audit box). */
  facts(pairs: readonly (readonly [string, string])[], labelWidth = 130): void {
    for (const [label, value] of pairs) {
      this.doc.font(FONT_REGULAR).fontSize(SIZE.body);
      const h = Math.max(
        this.doc.heightOfString(value, { width: CONTENT_WIDTH - labelWidth }),
        this.doc.heightOfString(label, { width: labelWidth - 8 }),
      );
      this.keep(h + 4);
      const y = this.doc.y;
      this.doc.fillColor(INK_SOFT).text(label, MARGIN.left, y, { width: labelWidth - 8 });
      this.doc.fillColor(INK).text(value, MARGIN.left + labelWidth, y, {
        width: CONTENT_WIDTH - labelWidth,
        features: [...TNUM],
      });
      this.doc.y = y + h + 4;
    }
    this.doc.fillColor(INK);
  }

  /** A ruled table; the header repeats after a page break. */
  table(columns: readonly Column[], rows: readonly TableRow[], options: TableOptions = {}): void {
    const size = options.fontSize ?? SIZE.table;
    const totalWeight = columns.reduce((s, c) => s + c.width, 0);
    const widths = columns.map((c) => (c.width / totalWeight) * CONTENT_WIDTH);
    const xs: number[] = [];
    widths.reduce((x, w) => (xs.push(x), x + w), MARGIN.left);
    const pad = 4;
    const vpad = 2.3;
    // Many columns: smaller header type, so a word like "diversification" fits its column.
    const headerSize = columns.length > 6 ? Math.min(size, 7) : size;
    const rowHeight = (cells: readonly string[], font: string, fontSize = size, indent = 0) => {
      this.doc.font(font).fontSize(fontSize);
      return (
        Math.max(
          ...cells.map((c, i) =>
            this.doc.heightOfString(c || ' ', { width: widths[i] - 2 * pad - (i === 0 ? indent : 0) }),
          ),
        ) +
        2 * vpad
      );
    };
    const drawRow = (
      cells: readonly string[],
      font: string,
      colour: string,
      y: number,
      h: number,
      fontSize = size,
      indent = 0,
    ) => {
      this.doc.font(font).fontSize(fontSize).fillColor(colour);
      cells.forEach((cell, i) => {
        const align = columns[i].align ?? 'left';
        const shift = i === 0 ? indent : 0;
        this.doc.text(cell, xs[i] + pad + shift, y + vpad, {
          width: widths[i] - 2 * pad - shift,
          align,
          features: i === 0 ? undefined : [...TNUM],
          lineBreak: true,
          height: h,
        });
      });
    };
    const header = () => {
      const h = rowHeight(
        columns.map((c) => c.header),
        FONT_BOLD,
        headerSize,
      );
      const y = this.doc.y;
      drawRow(
        columns.map((c) => c.header),
        FONT_BOLD,
        INK_SOFT,
        y,
        h,
        headerSize,
      );
      this.rule(y + h, INK, 0.7);
      this.doc.y = y + h;
    };
    const firstHeight = rows.length > 0 ? rowHeight(rows[0].cells, FONT_REGULAR) : 0;
    this.keep(
      rowHeight(
        columns.map((c) => c.header),
        FONT_BOLD,
      ) +
        firstHeight * Math.min(3, rows.length),
    );
    header();
    rows.forEach((row, r) => {
      const font = row.total ? FONT_BOLD : FONT_REGULAR;
      const h = rowHeight(row.cells, font, size, row.swatch ? SWATCH : 0);
      if (this.doc.y + h > this.bottom) {
        this.newPage();
        header();
      }
      const y = this.doc.y;
      if (row.total) this.rule(y, INK, 0.6);
      if (row.swatch) {
        this.doc.rect(xs[0] + pad, y + vpad + 1.5, 7, 7).fill(row.swatch);
        drawRow(row.cells, font, row.muted ? INK_SOFT : INK, y, h, size, SWATCH);
      } else drawRow(row.cells, font, row.muted ? INK_SOFT : INK, y, h);
      this.doc.y = y + h;
      if (!row.total && r < rows.length - 1 && !rows[r + 1].total) this.rule(this.doc.y, RULE_SOFT, 0.5);
    });
    this.rule(this.doc.y, RULE, 0.7);
    this.doc.fillColor(INK).font(FONT_REGULAR).fontSize(SIZE.body);
    this.doc.x = MARGIN.left;
    this.space(8);
  }

  rule(
    y: number,
    colour: string,
    width: number,
    x0: number = MARGIN.left,
    x1: number = MARGIN.left + CONTENT_WIDTH,
  ): void {
    this.doc.moveTo(x0, y).lineTo(x1, y).lineWidth(width).strokeColor(colour).stroke();
  }

  /** A chart with its title (the finding in words) above and its caption (units, basis) below. */
  chart(svg: string, height: number, title: string, caption: string, width: number = CONTENT_WIDTH): void {
    this.doc.font(FONT_BOLD).fontSize(SIZE.body);
    const titleH = this.doc.heightOfString(title, { width: CONTENT_WIDTH });
    this.doc.font(FONT_REGULAR).fontSize(SIZE.small);
    const capH = this.doc.heightOfString(caption, { width: CONTENT_WIDTH });
    this.keep(titleH + height + capH + 16);
    this.doc.font(FONT_BOLD).fontSize(SIZE.body).fillColor(INK).text(title, MARGIN.left, this.doc.y, {
      width: CONTENT_WIDTH,
    });
    this.space(4);
    const y = this.doc.y;
    SVGtoPDF(this.doc, svg, MARGIN.left, y, {
      width,
      height,
      assumePt: true,
      fontCallback: (_family: string, bold: boolean) => (bold ? FONT_BOLD : FONT_REGULAR),
      warningCallback: () => undefined,
    });
    this.doc.y = y + height + 3;
    this.doc
      .font(FONT_REGULAR)
      .fontSize(SIZE.small)
      .fillColor(INK_SOFT)
      .text(caption, MARGIN.left, this.doc.y, { width: CONTENT_WIDTH, lineGap: 1.5 });
    this.doc.fillColor(INK).fontSize(SIZE.body);
    this.space(10);
  }

  /** Draws the running footer on every page, once the page count is known. */
  footers(left: (page: number, pages: number) => string, right: (page: number, pages: number) => string): void {
    const range = this.doc.bufferedPageRange();
    for (let i = range.start; i < range.start + range.count; i++) {
      this.doc.switchToPage(i);
      // Drawing below the bottom margin would make pdfkit open a new page; lift it for the footer.
      const saved = this.doc.page.margins.bottom;
      this.doc.page.margins.bottom = 0;
      const y = PAGE.height - MARGIN.bottom + 30;
      this.rule(y - 6, RULE, 0.5);
      this.doc.font(FONT_REGULAR).fontSize(7).fillColor(INK_SOFT);
      // One line: whatever does not fit ends in an ellipsis.
      let text = left(i + 1, range.count);
      const room = CONTENT_WIDTH - 90;
      if (this.doc.widthOfString(text) > room) {
        while (text.length > 1 && this.doc.widthOfString(`${text}\u2026`) > room) text = text.slice(0, -1);
        text = `${text.trimEnd()}\u2026`;
      }
      this.doc.text(text, MARGIN.left, y, { width: room, lineBreak: false, features: [...TNUM] });
      this.doc.text(right(i + 1, range.count), MARGIN.left + CONTENT_WIDTH - 80, y, {
        width: 80,
        align: 'right',
        lineBreak: false,
        features: [...TNUM],
      });
      this.doc.page.margins.bottom = saved;
    }
  }

  async finish(): Promise<Buffer> {
    if (this.pending.length > 0) throw new Error(`heading '${this.pending[0].text}' has nothing after it`);
    this.doc.end();
    await this.finished;
    return Buffer.concat(this.chunks);
  }
}
