/**
 * Renders a ReportModel to PDF bytes with @react-pdf/renderer, in two passes:
 *
 * 1. measure: every block (heading, paragraph, table row, formula, figure …) is laid out once on
 *    a single tall page to learn its height;
 * 2. print: the page breaker (./paginate) assigns blocks to A4 pages (headings kept with what
 *    follows, table headers repeated, nothing beyond the page), and the static pages are rendered.
 *
 * This keeps react-pdf from re-flowing the whole remaining document for every page (its own
 * pagination does, twice over with page-number render props), and gives exact control of page
 * breaks. Deterministic for a given model: the document's creation date is the model's issue
 * date, and nothing else in the file depends on the clock or on chance.
 */
import { createElement, type ReactElement } from "react";
import { Font, pdf, renderToBuffer, type DocumentProps } from "@react-pdf/renderer";
import layoutDocument from "@react-pdf/layout";
import { reportBlocks } from "../../pdf/blocks";
import { startShapingCache } from "../../pdf/fonts";
import type { Block } from "../../pdf/block";
import { CONTENT_HEIGHT, MeasureDocument, ReportPagesDocument } from "../../pdf/ReportDocument";
import { reportModelSchema, type ReportModel } from "./model";
import { paginateBlocks, type PageItem } from "./paginate";

interface LaidOutNode {
  box?: { height?: number; marginTop?: number; marginBottom?: number };
  children?: LaidOutNode[];
}

const asDocumentElement = (el: ReactElement) => el as ReactElement<DocumentProps>;

/**
 * Heights of the blocks (pt), measured by laying them out once with react-pdf's own layout
 * engine (the same one that lays out the printed pages, at the same width and styles).
 */
export async function measureBlocks(blocks: Block[]): Promise<number[]> {
  const instance = pdf(asDocumentElement(createElement(MeasureDocument, { blocks })));
  const container: unknown = instance.container;
  const documentNode = (container as { document?: unknown }).document;
  // @react-pdf/layout takes the font store as a second argument (as the renderer passes it).
  const run = layoutDocument as unknown as (doc: unknown, fonts: unknown) => Promise<LaidOutNode>;
  const laid = await run(documentNode, Font);
  const pageNode = laid.children?.[0];
  const nodes = pageNode?.children ?? [];
  if (nodes.length !== blocks.length) {
    throw new Error(`report layout returned ${nodes.length} blocks for ${blocks.length}: the react-pdf layout engine changed`);
  }
  return nodes.map((n, i) => {
    const h = n.box?.height;
    if (typeof h !== "number" || !Number.isFinite(h)) throw new Error(`report block ${blocks[i].key} has no measured height`);
    return h;
  });
}

/** Blocks, their page assignment and the page count, for a model (no PDF yet). */
export async function layoutReport(model: ReportModel): Promise<{ blocks: Block[]; pages: PageItem[][] }> {
  // Loads the fonts (block building measures text with them) and starts this report's shaping memo.
  await startShapingCache();
  const blocks = reportBlocks(model);
  const heights = await measureBlocks(blocks);
  const pages = paginateBlocks(
    blocks.map((b, i) => ({ height: heights[i], spaceBefore: b.spaceBefore, keepWithNext: b.keepWithNext, table: b.table, tableHeader: b.tableHeader })),
    CONTENT_HEIGHT,
  );
  return { blocks, pages };
}

/**
 * The report as PDF bytes (unsigned).
 *
 * @param model the report data; validated with the ReportModel schema first.
 * @throws ZodError when the model is not valid (field paths and messages name the problem).
 */
export async function renderReportPdf(model: ReportModel): Promise<Buffer> {
  const valid = reportModelSchema.parse(model);
  const { blocks, pages } = await layoutReport(valid);
  return renderToBuffer(asDocumentElement(createElement(ReportPagesDocument, { model: valid, blocks, pages })));
}
