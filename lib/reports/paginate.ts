/**
 * Page breaking for the report. The document is a flat list of unbreakable blocks (headings,
 * paragraphs, table rows, formulas, figures …) whose heights were measured once; this packs them
 * onto pages of a fixed content height:
 *
 * - a block marked keepWithNext (a heading, a table's header row, a group row) never ends a
 *   page: the chain of such blocks moves to the next page together with the block after it;
 * - when a table continues on a new page, its header row is repeated at the top;
 * - the space above a block is dropped at the top of a page;
 * - nothing is placed beyond the content height (a block taller than a page is refused).
 */

/** What the page breaker needs to know about one block. */
export interface FlowBlock {
  /** Measured height, pt (border box, without the space above). */
  height: number;
  /** Space above the block when it does not start a page, pt. */
  spaceBefore: number;
  /** Never end a page with this block. */
  keepWithNext?: boolean;
  /** Table the block belongs to (rows and the header row). */
  table?: string;
  /** This block is the header row of `table`. */
  tableHeader?: boolean;
}

/** One placed item: a block by index, or a repeated table header. */
export type PageItem = { kind: "block"; index: number; spaceBefore: number } | { kind: "header"; table: string; index: number; spaceBefore: 0 };

/** Tolerance for rounding in measured heights, pt. */
const EPS = 0.01;

/**
 * Splits `blocks` into pages of `pageHeight` points.
 *
 * @param blocks the blocks in reading order, with measured heights (pt).
 * @param pageHeight usable content height of a page, pt.
 * @returns pages, each a list of items with the space to leave above them (pt).
 * @throws Error when a single block (with a repeated header if it needs one) is taller than a page.
 */
export function paginateBlocks(blocks: FlowBlock[], pageHeight: number): PageItem[][] {
  const headerIndex = new Map<string, number>();
  blocks.forEach((b, i) => {
    if (b.tableHeader && b.table && !headerIndex.has(b.table)) headerIndex.set(b.table, i);
  });
  /** A row of a table whose header already appeared needs the header repeated at a page top. */
  const needsHeader = (i: number): number | undefined => {
    const b = blocks[i];
    if (!b.table || b.tableHeader) return undefined;
    const h = headerIndex.get(b.table);
    return h !== undefined && h < i ? h : undefined;
  };

  for (let i = 0; i < blocks.length; i++) {
    const h = needsHeader(i);
    const alone = blocks[i].height + (h !== undefined ? blocks[h].height : 0);
    if (alone > pageHeight + EPS) {
      throw new Error(`report block ${i + 1} of ${blocks.length} is ${alone.toFixed(1)} pt tall, more than a page (${pageHeight.toFixed(1)} pt)`);
    }
  }

  const pages: PageItem[][] = [];
  let page: PageItem[] = [];
  let y = 0;

  /** Height the chain starting at `i` takes if placed at the current position (or a fresh page). */
  const chainHeight = (i: number, atTop: boolean): number => {
    let total = 0;
    let first = true;
    for (let k = i; k < blocks.length; k++) {
      const b = blocks[k];
      if (first && atTop) {
        const hdr = needsHeader(k);
        if (hdr !== undefined) total += blocks[hdr].height;
      } else {
        total += b.spaceBefore;
      }
      total += b.height;
      first = false;
      if (!b.keepWithNext) break;
    }
    return total;
  };

  const newPage = () => {
    pages.push(page);
    page = [];
    y = 0;
  };

  for (let i = 0; i < blocks.length; i++) {
    const b = blocks[i];
    const atTop = page.length === 0;
    if (!atTop) {
      const need = chainHeight(i, false);
      // Move the chain to a fresh page when it does not fit here, unless it would not fit on a
      // fresh page either (then keep filling: only the chain's tail moves on).
      const fitsHere = y + need <= pageHeight + EPS;
      const fitsFresh = chainHeight(i, true) <= pageHeight + EPS;
      const blockFits = y + b.spaceBefore + b.height <= pageHeight + EPS;
      if (!blockFits || (!fitsHere && fitsFresh)) newPage();
    }
    if (page.length === 0) {
      const hdr = needsHeader(i);
      if (hdr !== undefined) {
        page.push({ kind: "header", table: blocks[hdr].table as string, index: hdr, spaceBefore: 0 });
        y += blocks[hdr].height;
      }
      page.push({ kind: "block", index: i, spaceBefore: 0 });
      y += b.height;
    } else {
      page.push({ kind: "block", index: i, spaceBefore: b.spaceBefore });
      y += b.spaceBefore + b.height;
    }
  }
  if (page.length) pages.push(page);
  return pages;
}
