import { describe, expect, it } from "vitest";
import { paginateBlocks, type FlowBlock, type PageItem } from "@/lib/reports/paginate";

const H = 100;
const used = (page: PageItem[], blocks: FlowBlock[]) => page.reduce((y, it) => y + it.spaceBefore + blocks[it.index].height, 0);
const indices = (pages: PageItem[][]) => pages.map((p) => p.map((it) => (it.kind === "header" ? `H${it.index}` : String(it.index))));

describe("paginateBlocks", () => {
  it("fills pages in order and never goes past the page height", () => {
    const blocks: FlowBlock[] = Array.from({ length: 10 }, () => ({ height: 30, spaceBefore: 4 }));
    const pages = paginateBlocks(blocks, H);
    for (const p of pages) expect(used(p, blocks)).toBeLessThanOrEqual(H);
    expect(pages.flat().map((it) => it.index)).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8, 9]);
    // 30 + 34 + 34 = 98 fits, a fourth (132) does not.
    expect(indices(pages)).toEqual([["0", "1", "2"], ["3", "4", "5"], ["6", "7", "8"], ["9"]]);
  });

  it("drops the space above a block that starts a page", () => {
    const blocks: FlowBlock[] = [{ height: 90, spaceBefore: 0 }, { height: 50, spaceBefore: 20 }];
    const pages = paginateBlocks(blocks, H);
    expect(pages[1][0]).toEqual({ kind: "block", index: 1, spaceBefore: 0 });
  });

  it("never leaves a heading alone at the foot of a page", () => {
    const blocks: FlowBlock[] = [
      { height: 70, spaceBefore: 0 },
      { height: 10, spaceBefore: 6, keepWithNext: true }, // heading: fits at 86
      { height: 25, spaceBefore: 0 }, // its first paragraph would end at 111
    ];
    expect(indices(paginateBlocks(blocks, H))).toEqual([["0"], ["1", "2"]]);
  });

  it("keeps a chain of headings with the block after it", () => {
    const blocks: FlowBlock[] = [
      { height: 60, spaceBefore: 0 },
      { height: 8, spaceBefore: 4, keepWithNext: true }, // section heading
      { height: 8, spaceBefore: 2, keepWithNext: true }, // sub-heading
      { height: 10, spaceBefore: 0, keepWithNext: true, table: "t", tableHeader: true },
      { height: 10, spaceBefore: 0, table: "t" }, // ends at 102: the whole chain moves
    ];
    expect(indices(paginateBlocks(blocks, H))).toEqual([["0"], ["1", "2", "3", "4"]]);
  });

  it("repeats a table's header row on each page the table continues onto", () => {
    const blocks: FlowBlock[] = [
      { height: 12, spaceBefore: 0, keepWithNext: true, table: "t", tableHeader: true },
      ...Array.from({ length: 12 }, () => ({ height: 20, spaceBefore: 0, table: "t" })),
      { height: 20, spaceBefore: 10 },
    ];
    const pages = paginateBlocks(blocks, H);
    expect(indices(pages)).toEqual([
      ["0", "1", "2", "3", "4"],
      ["H0", "5", "6", "7", "8"],
      ["H0", "9", "10", "11", "12"],
      ["13"], // not a table row: no header
    ]);
    for (const p of pages) expect(used(p, blocks)).toBeLessThanOrEqual(H);
  });

  it("keeps a group row with its first row, and repeats the header above both", () => {
    const blocks: FlowBlock[] = [
      { height: 10, spaceBefore: 0, keepWithNext: true, table: "t", tableHeader: true },
      { height: 40, spaceBefore: 0, table: "t" },
      { height: 40, spaceBefore: 0, table: "t" },
      { height: 8, spaceBefore: 0, keepWithNext: true, table: "t" }, // group row at 98
      { height: 20, spaceBefore: 0, table: "t" },
    ];
    expect(indices(paginateBlocks(blocks, H))).toEqual([["0", "1", "2"], ["H0", "3", "4"]]);
  });

  it("does not loop when a chain is taller than a page", () => {
    const blocks: FlowBlock[] = [
      { height: 50, spaceBefore: 0, keepWithNext: true },
      { height: 60, spaceBefore: 0, keepWithNext: true },
      { height: 30, spaceBefore: 0 },
    ];
    const pages = paginateBlocks(blocks, H);
    expect(pages.flat().map((it) => it.index)).toEqual([0, 1, 2]);
    for (const p of pages) expect(used(p, blocks)).toBeLessThanOrEqual(H);
  });

  it("refuses a block taller than a page instead of letting it overflow", () => {
    expect(() => paginateBlocks([{ height: 100.5, spaceBefore: 0 }], H)).toThrow(/more than a page/);
  });
});
