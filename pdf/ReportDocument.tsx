/**
 * The report documents: the block document (all blocks on one tall page, laid out once to learn
 * their heights) and the page document (A4 pages holding the blocks the page breaker assigned to
 * them, each with a running header and a footer with "Page X of Y"; lib/reports/render.ts lays
 * it out with empty content areas and moves the already laid-out blocks in).
 *
 * Pages are static (no render props): the page breaker already knows every page's content and
 * the page count, so react-pdf never re-flows the document.
 */
import type { ReactElement } from "react";
import { Document, Page, Text, View } from "@react-pdf/renderer";
import type { ReportModel } from "../lib/reports/model";
import type { PageItem } from "../lib/reports/paginate";
import "./fonts";
import type { Block } from "./block";
import { colors, page, s, TABULAR } from "./theme";
import { urlWithoutScheme } from "./text";
import { monoText } from "./parts/rich";

/** Height of the tall page blocks are measured on, pt (far more than any report needs). */
export const MEASURE_PAGE_HEIGHT = 1_000_000;
/** id of each page's content area (lib/reports/render.ts places the measured blocks in it). */
export const CONTENT_ID = "report-content";
/** Usable content height of an A4 page, pt. */
export const CONTENT_HEIGHT = page.height - page.marginTop - page.marginBottom;

/** All blocks, stacked without gaps on one tall page: laid out once, measured, then placed. */
export function MeasureDocument(props: { blocks: Block[] }): ReactElement {
  return (
    <Document>
      <Page size={[page.width, MEASURE_PAGE_HEIGHT]} style={s.page} wrap={false}>
        {props.blocks.map((b) => (
          <View key={b.key}>{b.el}</View>
        ))}
      </Page>
    </Document>
  );
}

function RunningHeader(props: { model: ReportModel }) {
  const { model } = props;
  return (
    <View style={s.header}>
      <Text style={{ flexGrow: 1, flexShrink: 1, flexBasis: 0, paddingRight: 12, maxLines: 1, textOverflow: "ellipsis" }}>
        {`${model.calculation.number} rev. ${model.calculation.revision} · ${model.calculation.title}`}
      </Text>
      <Text style={{ width: 200, textAlign: "right", color: colors.muted, maxLines: 1, textOverflow: "ellipsis" }}>
        {`${model.workspace.name} · ${model.project.jobNumber ? `job ${model.project.jobNumber}` : model.project.name}`}
      </Text>
    </View>
  );
}

function Footer(props: { model: ReportModel; pageNumber: number; totalPages: number }) {
  const { model } = props;
  return (
    <View style={s.footer}>
      <Text style={{ flexGrow: 1, flexShrink: 1, flexBasis: 0, maxLines: 1, textOverflow: "ellipsis" }}>
        <Text style={{ color: colors.muted }}>Verification code </Text>
        <Text style={[s.mono, { fontWeight: 500, color: colors.ink }]}>{monoText(model.verification.code)}</Text>
        <Text style={{ color: colors.muted }}>{`   verify at ${urlWithoutScheme(model.verification.url)}`}</Text>
      </Text>
      <Text style={{ width: 96, textAlign: "center", color: colors.muted, fontFeatureSettings: TABULAR }}>{`Issue date ${model.issueDate}`}</Text>
      <Text style={{ width: 72, textAlign: "right", color: colors.ink, fontFeatureSettings: TABULAR }}>{`Page ${props.pageNumber} of ${props.totalPages}`}</Text>
    </View>
  );
}

/** The printed report: one A4 page per list of placed items. */
export function ReportPagesDocument(props: { model: ReportModel; blocks: Block[]; pages: PageItem[][] }): ReactElement {
  const { model, blocks, pages } = props;
  const c = model.calculation;
  const issued = new Date(`${model.issueDate}T00:00:00Z`);
  return (
    <Document
      title={`${c.number} rev. ${c.revision} – ${c.title}`}
      author={model.workspace.name}
      subject={`Calculation report for ${model.project.name}${model.project.clientName ? `, ${model.project.clientName}` : ""}`}
      keywords={`${model.verification.code} ${c.typeId}`}
      creator="Loopwright"
      producer="Loopwright"
      creationDate={issued}
      modificationDate={issued}
      language="en"
    >
      {pages.map((items, p) => (
        // A page without wrapping takes its height from its content: the content area has the
        // exact height of an A4 text block, so every page is exactly A4.
        <Page key={p} size="A4" style={s.page} wrap={false}>
          {p > 0 ? <RunningHeader model={model} /> : null}
          <View id={CONTENT_ID} style={{ height: CONTENT_HEIGHT }}>
            {items.map((it) => (
              <View key={it.kind === "header" ? `h${p}:${it.index}` : blocks[it.index].key} style={it.spaceBefore ? { marginTop: it.spaceBefore } : undefined}>
                {blocks[it.index].el}
              </View>
            ))}
          </View>
          <Footer model={model} pageNumber={p + 1} totalPages={pages.length} />
        </Page>
      ))}
    </Document>
  );
}
