/**
 * Renders a ReportModel to PDF bytes with react-pdf's layout engine and renderer, laying the
 * text out once:
 *
 * 1. blocks: every unbreakable piece (heading, paragraph, table row, formula, figure …) is laid
 *    out once on a single tall page, which gives its height;
 * 2. pages: the page breaker (./paginate) assigns blocks to A4 pages (headings kept with what
 *    follows, table headers repeated, nothing beyond the page);
 * 3. frames: the A4 pages with their running header and footer ("Page X of Y") are laid out with
 *    empty content areas, the laid-out blocks are moved into them, and react-pdf's renderer
 *    draws the result.
 *
 * react-pdf's own pagination re-flows all remaining content for every page (twice over with
 * page-number render props), which made a 6-page report cost seconds; here no text is laid out
 * twice. Deterministic for a given model: the document's creation date is the model's issue
 * date, and nothing else in the file depends on the clock or on chance.
 *
 * This uses two packages of @react-pdf/renderer's own tree directly (@react-pdf/layout to lay
 * out without drawing, @react-pdf/render to draw laid-out pages) and pdfkit, exactly as the
 * renderer does; the report tests check the result with poppler.
 */
import { createElement, type ReactElement } from "react";
import { Font, pdf, type DocumentProps } from "@react-pdf/renderer";
import layoutDocument from "@react-pdf/layout";
import renderLaidOut from "@react-pdf/render";
import PDFDocument from "pdfkit";
import { reportBlocks } from "../../pdf/blocks";
import { startShapingCache } from "../../pdf/fonts";
import type { Block } from "../../pdf/block";
import { CONTENT_HEIGHT, CONTENT_ID, MeasureDocument, ReportPagesDocument } from "../../pdf/ReportDocument";
import { reportModelSchema, type ReportModel } from "./model";
import { paginateBlocks, type PageItem } from "./paginate";

/** A node of react-pdf's laid-out tree, as far as this file reads it. */
interface LaidOutNode {
  type?: string;
  props?: Record<string, unknown>;
  box?: { top: number; left: number; height: number; [k: string]: number };
  children?: LaidOutNode[];
}

const asDocumentElement = (el: ReactElement) => el as ReactElement<DocumentProps>;

/** Lays a react-pdf document out (styles, text, yoga, pagination) without drawing it. */
async function layOut(el: ReactElement): Promise<LaidOutNode> {
  const instance = pdf(asDocumentElement(el));
  const container: unknown = instance.container;
  const documentNode = (container as { document?: unknown }).document;
  // @react-pdf/layout takes the font store as a second argument, as the renderer passes it.
  const run = layoutDocument as unknown as (doc: unknown, fonts: unknown) => Promise<LaidOutNode>;
  return run(documentNode, Font);
}

interface Laid {
  blocks: Block[];
  /** The laid-out block nodes, in the order of `blocks`. */
  nodes: LaidOutNode[];
  heights: number[];
  pages: PageItem[][];
}

async function layOutReport(model: ReportModel): Promise<Laid> {
  // Loads the fonts (block building measures text with them) and starts this report's shaping memo.
  await startShapingCache();
  const blocks = reportBlocks(model);
  const tall = await layOut(createElement(MeasureDocument, { blocks }));
  const nodes = tall.children?.[0]?.children ?? [];
  if (nodes.length !== blocks.length) {
    throw new Error(`report layout returned ${nodes.length} blocks for ${blocks.length}: the react-pdf layout engine changed`);
  }
  const heights = nodes.map((n, i) => {
    const h = n.box?.height;
    if (typeof h !== "number" || !Number.isFinite(h)) throw new Error(`report block ${blocks[i].key} has no measured height`);
    return h;
  });
  const pages = paginateBlocks(
    blocks.map((b, i) => ({ height: heights[i], spaceBefore: b.spaceBefore, keepWithNext: b.keepWithNext, table: b.table, tableHeader: b.tableHeader })),
    CONTENT_HEIGHT,
  );
  return { blocks, nodes, heights, pages };
}

/** Blocks and their page assignment for a model (no PDF). */
export async function layoutReport(model: ReportModel): Promise<{ blocks: Block[]; pages: PageItem[][] }> {
  const { blocks, pages } = await layOutReport(model);
  return { blocks, pages };
}

/** Draws a laid-out document with react-pdf's renderer into a new pdfkit document. */
async function draw(doc: LaidOutNode, model: ReportModel): Promise<Buffer> {
  const c = model.calculation;
  const issued = new Date(`${model.issueDate}T00:00:00Z`);
  // The options @react-pdf/renderer gives pdfkit, with the same document information.
  const ctx = new PDFDocument({
    compress: true,
    lang: "en",
    displayTitle: true,
    autoFirstPage: false,
    info: {
      Title: `${c.number} rev. ${c.revision} – ${c.title}`,
      Author: model.workspace.name,
      Subject: `Calculation report for ${model.project.name}${model.project.clientName ? `, ${model.project.clientName}` : ""}`,
      Keywords: `${model.verification.code} ${c.typeId}`,
      Creator: "Loopwright",
      Producer: "Loopwright",
      CreationDate: issued,
      ModDate: issued,
    },
  });
  const chunks: Buffer[] = [];
  const done = new Promise<void>((resolve, reject) => {
    ctx.on("data", (chunk: Buffer) => chunks.push(chunk));
    ctx.on("end", () => resolve());
    ctx.on("error", reject);
  });
  renderLaidOut(ctx as unknown as Parameters<typeof renderLaidOut>[0], doc as unknown as Parameters<typeof renderLaidOut>[1]);
  await done;
  return Buffer.concat(chunks);
}

/**
 * The report as PDF bytes (unsigned).
 *
 * @param model the report data; validated with the ReportModel schema first.
 * @throws ZodError when the model is not valid (field paths and messages name the problem).
 */
export async function renderReportPdf(model: ReportModel): Promise<Buffer> {
  const valid = reportModelSchema.parse(model);
  const { nodes, heights, pages } = await layOutReport(valid);
  const frames = await layOut(createElement(ReportPagesDocument, { model: valid, blocks: [], pages: pages.map(() => []) }));
  const framePages = frames.children ?? [];
  if (framePages.length !== pages.length) throw new Error("report page frames do not match the page count");
  framePages.forEach((framePage, p) => {
    const slot = framePage.children?.find((n) => n.props?.id === CONTENT_ID);
    if (!slot) throw new Error("report page frame has no content area: the react-pdf layout engine changed");
    let y = 0;
    slot.children = pages[p].map((it) => {
      y += it.spaceBefore;
      const node = nodes[it.index];
      if (!node.box) throw new Error("report block has no box");
      // Boxes are relative to the parent: the block sits at the left of the content area.
      const placed: LaidOutNode = { ...node, box: { ...node.box, left: 0, top: y } };
      y += heights[it.index];
      return placed;
    });
  });
  return draw(frames, valid);
}
