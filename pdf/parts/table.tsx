/**
 * Tables as blocks: the header row, group rows and body rows are separate unbreakable blocks,
 * so a table breaks between rows; the page breaker repeats the header row on each new page and
 * keeps the header and group rows with the row below them.
 */
import type { ReactNode } from "react";
import { Text, View } from "@react-pdf/renderer";
import type { Block } from "../block";
import { colors, s, TABULAR, type PdfStyle } from "../theme";
import { looksNumeric } from "../text";
import { withSubscripts } from "./rich";

export interface Column<T> {
  key: string;
  label: string;
  /** Width in points; columns without a width share what is left. */
  width?: number;
  align?: "left" | "right";
  /** Cell content: text (printed in a cell) or a ready element; default row[key] as text. */
  cell?: (row: T) => ReactNode;
  /** Extra style for the body cells of this column. */
  style?: PdfStyle;
  /** Print "X_y" as X with subscript y (symbols). */
  rich?: boolean;
}

/** A body row, or a group heading row spanning all columns. */
export type TableRow<T> = { kind: "row"; row: T } | { kind: "group"; title: string };

function widthStyle<T>(col: Column<T>): PdfStyle {
  return col.width !== undefined ? { width: col.width } : { flexGrow: 1, flexShrink: 1, flexBasis: 0 };
}

/** The blocks of one table: header, then group and body rows in order. */
export function tableBlocks<T>(id: string, columns: Column<T>[], rows: TableRow<T>[], spaceBefore = 0): Block[] {
  const header = (
    <View style={s.thead}>
      {columns.map((c) => (
        <Text key={c.key} style={[s.th, widthStyle(c), { textAlign: c.align ?? "left" }]}>
          {c.label}
        </Text>
      ))}
    </View>
  );
  const blocks: Block[] = [{ key: `${id}:head`, el: header, spaceBefore, keepWithNext: true, table: id, tableHeader: true }];
  rows.forEach((r, i) => {
    const last = i === rows.length - 1;
    if (r.kind === "group") {
      blocks.push({
        key: `${id}:g${i}`,
        el: (
          <View style={s.groupRow}>
            <Text style={s.groupCell}>{r.title}</Text>
          </View>
        ),
        spaceBefore: 0,
        keepWithNext: true,
        table: id,
      });
      return;
    }
    blocks.push({
      key: `${id}:r${i}`,
      el: (
        <View style={last ? s.trLast : s.tr}>
          {columns.map((c) => {
            const content = c.cell ? c.cell(r.row) : String((r.row as Record<string, unknown>)[c.key] ?? "");
            if (typeof content !== "string") {
              return (
                <View key={c.key} style={widthStyle(c)}>
                  {content}
                </View>
              );
            }
            const base = c.align === "right" ? s.tdNum : s.td;
            const digits = looksNumeric(content) ? { fontFeatureSettings: TABULAR } : {};
            return (
              <Text key={c.key} style={[base, digits, widthStyle(c), c.style ?? {}]}>
                {c.rich ? withSubscripts(content, ((c.style?.fontSize as number | undefined) ?? 8.2)) : content}
              </Text>
            );
          })}
        </View>
      ),
      spaceBefore: 0,
      table: id,
    });
  });
  if (rows.length === 0) {
    blocks.push({
      key: `${id}:empty`,
      el: (
        <View style={s.trLast}>
          <Text style={[s.td, { color: colors.muted }]}>None.</Text>
        </View>
      ),
      spaceBefore: 0,
      table: id,
    });
  }
  return blocks;
}

/** Rows with a group heading row wherever `groupOf` changes (undefined groups get none). */
export function groupRows<T>(items: T[], groupOf: (item: T) => string | undefined): TableRow<T>[] {
  const out: TableRow<T>[] = [];
  let current: string | undefined;
  for (const item of items) {
    const g = groupOf(item);
    if (g && g !== current) out.push({ kind: "group", title: g });
    current = g;
    out.push({ kind: "row", row: item });
  }
  return out;
}

/** Body rows without groups. */
export function plainRows<T>(items: T[]): TableRow<T>[] {
  return items.map((row) => ({ kind: "row" as const, row }));
}
