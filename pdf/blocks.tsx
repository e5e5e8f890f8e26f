/**
 * The report's content as a flat list of unbreakable blocks, in reading order:
 * cover; purpose and scope; inputs; method and formulas; results (and result tables); checks;
 * plots; components; assumptions, cautions and the statement; revision history; sign-off,
 * engine version and verification. Layout only: every number arrives formatted in the model.
 */
import type { ReactElement, ReactNode } from "react";
import { Text, View } from "@react-pdf/renderer";
import type { Check, Component, LinePlot, Plot, ResultTable } from "../lib/calc/core/types";
import type { InputRow, ReportFormula, ReportModel, ReportResult, RevisionRow } from "../lib/reports/model";
import { formatFingerprint } from "../lib/reports/signing";
import type { Block } from "./block";
import { colors, contentWidth, s, severityStyle, TABULAR } from "./theme";
import { groupRows, plainRows, tableBlocks, type Column } from "./parts/table";
import { QrCode } from "./parts/QrCode";
import { monoText, withSubscripts } from "./parts/rich";
import { LinePlotChart, axisTitle, lineAxisUnits, seriesStyle } from "./plots/LinePlotChart";
import { HistogramChart, histogramAxisUnit } from "./plots/HistogramChart";
import { LevelsChart, levelsAxisUnit } from "./plots/LevelsChart";
import { estimateTextWidth } from "./plots/canvas";
import { formatMargin, formatTolerance, looksNumeric, statusLabel } from "./text";
import { textWidth } from "./fonts";

/** Longest paragraph piece printed as one block (longer paragraphs break at sentence ends). */
const MAX_PARAGRAPH_CHARS = 1400;

// --- small pieces -----------------------------------------------------------------------------

function KeyValue(props: { label: string; value: string; width: number; mono?: boolean; strong?: boolean }) {
  return (
    <View style={{ width: props.width, paddingRight: 8, marginBottom: 7 }}>
      <Text style={s.label}>{props.label}</Text>
      <Text style={[{ fontSize: 9.2, marginTop: 1.5, fontWeight: props.strong ? 600 : 400 }, props.mono ? s.mono : {}]}>{props.mono ? monoText(props.value || "—") : props.value || "—"}</Text>
    </View>
  );
}

/** Severity as word and glyph on a tint (colour is never the only signal). */
export function SeverityBadge(props: { severity: Check["severity"] }) {
  const st = severityStyle[props.severity];
  return (
    <View style={{ alignSelf: "flex-start", backgroundColor: st.tint, borderRadius: 2, paddingHorizontal: 4, paddingVertical: 1.2 }}>
      <Text style={{ fontSize: 7.2, fontWeight: 700, color: st.ink, letterSpacing: 0.4 }}>{`${st.glyph} ${st.word}`}</Text>
    </View>
  );
}

/** Splits text into paragraphs (blank lines) and long paragraphs into sentence groups. */
export function paragraphPieces(text: string, max = MAX_PARAGRAPH_CHARS): Array<{ text: string; continues: boolean }> {
  const out: Array<{ text: string; continues: boolean }> = [];
  for (const para of text.split(/\n\s*\n/).map((p) => p.replace(/\s*\n\s*/g, " ").trim()).filter(Boolean)) {
    if (para.length <= max) {
      out.push({ text: para, continues: false });
      continue;
    }
    const sentences = para.match(/[^.!?]+(?:[.!?]+(?=\s|$)|$)\s*/g) ?? [para];
    let piece = "";
    let first = true;
    const flush = () => {
      if (!piece.trim()) return;
      out.push({ text: piece.trim(), continues: !first });
      first = false;
      piece = "";
    };
    for (const sentence of sentences) {
      // A single sentence longer than the limit is cut at spaces.
      const parts = sentence.length > max ? (sentence.match(new RegExp(`.{1,${max}}(\\s|$)`, "g")) ?? [sentence]) : [sentence];
      for (const part of parts) {
        if (piece.length + part.length > max) flush();
        piece += part;
      }
    }
    flush();
  }
  return out;
}

// --- block builders ---------------------------------------------------------------------------

class Flow {
  blocks: Block[] = [];
  private n = 0;
  private seq = 0;

  add(el: ReactElement, spaceBefore: number, opts: Partial<Omit<Block, "el" | "spaceBefore" | "key">> = {}) {
    this.blocks.push({ key: `b${this.seq++}`, el, spaceBefore, ...opts });
  }
  addAll(blocks: Block[]) {
    this.blocks.push(...blocks);
  }
  /** A numbered section heading (kept with what follows). */
  section(title: string) {
    const n = ++this.n;
    this.add(
      <View style={s.h1}>
        <Text style={s.h1Num}>{String(n)}</Text>
        <Text style={s.h1Text}>{title}</Text>
      </View>,
      16,
      { keepWithNext: true },
    );
  }
  subheading(title: string, spaceBefore = 8) {
    this.add(<Text style={s.h2}>{title}</Text>, spaceBefore, { keepWithNext: true });
  }
  paragraphs(text: string, style = s.para) {
    for (const piece of paragraphPieces(text)) {
      this.add(<Text style={style}>{piece.text}</Text>, piece.continues ? 0 : 5);
    }
  }
}

function cover(model: ReportModel): ReactElement {
  const c = model.calculation;
  const col = (contentWidth - 96) / 4;
  const count = (sev: Check["severity"]) => model.checks.filter((x) => x.severity === sev).length;
  return (
    <View>
      <View style={{ flexDirection: "row", justifyContent: "space-between" }}>
        <View style={{ width: contentWidth - 92, paddingRight: 18 }}>
          <Text style={{ fontSize: 8, fontWeight: 600, color: colors.copper, letterSpacing: 1.2, textTransform: "uppercase" }}>{model.workspace.name}</Text>
          <Text style={[s.label, { marginTop: 12 }]}>Calculation report</Text>
          <Text style={{ fontSize: 17, fontWeight: 600, lineHeight: 1.22, marginTop: 3 }}>{c.title}</Text>
          <Text style={{ fontSize: 9, color: colors.ink2, marginTop: 4 }}>{`${c.typeTitle} · ${c.packTitle}`}</Text>
        </View>
        <View style={{ width: 92, alignItems: "center" }}>
          <QrCode value={model.verification.url} sizePt={76} />
          <Text style={[s.mono, { fontSize: 7.6, fontWeight: 500, marginTop: 1 }]}>{monoText(model.verification.code)}</Text>
          <Text style={{ fontSize: 6.2, color: colors.muted, textAlign: "center", marginTop: 1 }}>Scan or enter the code to verify</Text>
        </View>
      </View>
      {c.status !== "issued" ? (
        <View style={{ marginTop: 8, borderWidth: 0.8, borderColor: colors.ink, paddingVertical: 3, paddingHorizontal: 6 }}>
          <Text style={{ fontSize: 8, fontWeight: 600 }}>{`Not issued: this is a copy of the ${statusLabel(c.status).toLowerCase()} calculation for review. Only an issued, signed report may be relied on.`}</Text>
        </View>
      ) : null}
      <View style={{ marginTop: 12, borderTopWidth: 1.2, borderTopColor: colors.ink, borderBottomWidth: 0.6, borderBottomColor: colors.rule, paddingTop: 8, paddingBottom: 1 }}>
        <View style={{ flexDirection: "row" }}>
          <KeyValue label="Project" value={model.project.name} width={col * 2} strong />
          <KeyValue label="Client" value={model.project.clientName} width={col * 1.4} />
          <KeyValue label="Job number" value={model.project.jobNumber} width={contentWidth - col * 3.4} />
        </View>
        <View style={{ flexDirection: "row" }}>
          <KeyValue label="Calculation" value={c.number} width={col} strong />
          <KeyValue label="Revision" value={c.revision} width={col * 0.6} strong />
          <KeyValue label="Status" value={statusLabel(c.status)} width={col * 0.8} />
          <KeyValue label="Issue date" value={model.issueDate} width={col * 0.8} />
          <KeyValue label="Engine" value={`${model.engine.typeId}@${model.engine.version}`} width={contentWidth - col * 3.2} mono />
        </View>
      </View>
      <View style={{ flexDirection: "row", alignItems: "center", marginTop: 6 }}>
        {model.checks.length === 0 ? (
          <Text style={s.small}>No checks apply to this calculation.</Text>
        ) : (
          <>
            <Text style={[s.small, { marginRight: 8 }]}>{`${model.checks.length} checks:`}</Text>
            {(["pass", "warning", "fail"] as const).map((sev) => (
              <View key={sev} style={{ flexDirection: "row", alignItems: "center", marginRight: 10 }}>
                <SeverityBadge severity={sev} />
                <Text style={[s.small, { marginLeft: 3, color: colors.ink, fontFeatureSettings: TABULAR }]}>{String(count(sev))}</Text>
              </View>
            ))}
          </>
        )}
      </View>
    </View>
  );
}

function inputsTable(rows: InputRow[]): Block[] {
  const columns: Column<InputRow>[] = [
    { key: "symbol", label: "Symbol", width: 56, rich: true },
    { key: "description", label: "Description" },
    { key: "value", label: "Value", width: 88, align: "right" },
    { key: "unit", label: "Unit", width: 44 },
    { key: "source", label: "Source", width: 124, style: { color: colors.ink2, fontSize: 7.6, paddingTop: 3.1 } },
  ];
  return tableBlocks("inputs", columns, groupRows(rows, (r) => r.group));
}

function splitEquation(text: string): { lhs: string; rhs: string } {
  const i = text.indexOf(" = ");
  return i < 0 ? { lhs: "", rhs: text } : { lhs: text.slice(0, i), rhs: text.slice(i + 3) };
}

function formula(f: ReportFormula, n: number, lhsWidth: number): ReactElement {
  const sym = splitEquation(f.symbolic);
  const sub = splitEquation(f.substituted);
  const eqLine = (lhs: string, rhs: string, strong = false) => (
    <View style={{ flexDirection: "row" }}>
      <Text style={{ width: lhsWidth, textAlign: "right", fontSize: 9.2 }}>{withSubscripts(lhs, 9.2)}</Text>
      <Text style={{ width: 16, textAlign: "center", fontSize: 9.2 }}>=</Text>
      <Text style={{ flexGrow: 1, flexShrink: 1, flexBasis: 0, fontSize: 9.2, fontWeight: strong ? 600 : 400, fontFeatureSettings: TABULAR }}>{withSubscripts(rhs, 9.2)}</Text>
    </View>
  );
  return (
    <View style={{ flexDirection: "row", paddingVertical: 4.2, borderBottomWidth: 0.4, borderBottomColor: colors.ruleLight }}>
      <Text style={{ width: 26, color: colors.copper, fontSize: 8, fontWeight: 600, paddingTop: 0.8, fontFeatureSettings: TABULAR }}>{`(${n})`}</Text>
      <View style={{ flexGrow: 1, flexShrink: 1, flexBasis: 0 }}>
        <View style={{ flexDirection: "row", marginBottom: 2 }}>
          <Text style={{ fontSize: 8.2, fontWeight: 600, flexGrow: 1, flexShrink: 1, flexBasis: 0, paddingRight: 10 }}>{withSubscripts(f.label, 8.2)}</Text>
          {f.reference ? <Text style={{ fontSize: 7, color: colors.muted, width: 200, textAlign: "right", paddingTop: 1 }}>{f.reference}</Text> : null}
        </View>
        {eqLine(sym.lhs || f.symbol, sym.rhs)}
        {eqLine("", sub.rhs)}
        {eqLine("", f.resultText, true)}
      </View>
    </View>
  );
}

function resultsTable(rows: ReportResult[]): Block[] {
  const columns: Column<ReportResult>[] = [
    { key: "symbol", label: "Symbol", width: 66, rich: true },
    { key: "label", label: "Quantity" },
    { key: "valueText", label: "Value", width: 80, align: "right", style: { fontWeight: 600 } },
    { key: "unitText", label: "Unit", width: 58 },
  ];
  return tableBlocks("results", columns, groupRows(rows, (r) => r.group));
}

/** Cell padding left + right in tables, pt. */
const CELL_PAD = 8;
/** Body font sizes tried for a free table, largest first, until its columns fit the page. */
const FREE_TABLE_SIZES = [8.2, 7.6, 7.0, 6.4];

/**
 * Column widths of a free table: every column at least as wide as its longest word (so nothing
 * runs out of its cell), the rest of the page width shared in proportion to how much wider each
 * column would like to be (its longest cell on one line). Wide tables get a smaller font.
 * @returns widths in pt and the body font size
 */
export function freeTableLayout(table: ResultTable, width = contentWidth): { widths: number[]; fontSize: number } {
  const words = (s: string) => s.split(/\s+/).filter(Boolean);
  const measure = (size: number) =>
    table.columns.map((c) => {
      const cells = table.rows.map((r) => (r[c.key] ?? "").replace(/_/g, ""));
      const head = c.label.replace(/_/g, "");
      const w = (t: string, sz: number, weight = 400) => textWidth(t, sz, { weight, tabular: looksNumeric(t) });
      const min = Math.max(...words(head).map((x) => w(x, 7.2, 600)), ...cells.flatMap((t) => words(t).map((x) => w(x, size))), 6) + CELL_PAD + 1;
      const pref = Math.max(w(head, 7.2, 600), ...cells.map((t) => w(t, size)), 6) + CELL_PAD + 1;
      return { min, pref: Math.max(pref, min) };
    });
  let fontSize = FREE_TABLE_SIZES[0];
  let cols = measure(fontSize);
  for (const size of FREE_TABLE_SIZES) {
    fontSize = size;
    cols = measure(size);
    if (cols.reduce((a, c) => a + c.min, 0) <= width) break;
  }
  const minSum = cols.reduce((a, c) => a + c.min, 0);
  const spare = Math.max(0, width - minSum);
  const want = cols.reduce((a, c) => a + (c.pref - c.min), 0);
  const widths = cols.map((c) => {
    const share = want > 0 ? Math.min(c.pref - c.min, (spare * (c.pref - c.min)) / want) : 0;
    return c.min + share;
  });
  // Whatever is still spare (all columns at their preferred width) is shared in proportion.
  const sum = widths.reduce((a, b) => a + b, 0);
  if (width > sum && sum > 0) for (let i = 0; i < widths.length; i++) widths[i] *= width / sum;
  const scale = minSum > width ? width / minSum : 1;
  return { widths: widths.map((w) => w * scale), fontSize };
}

function freeTable(table: ResultTable, spaceBefore: number): Block[] {
  const { widths, fontSize } = freeTableLayout(table);
  const columns: Column<Record<string, string>>[] = table.columns.map((c, i) => ({
    key: c.key,
    label: c.label,
    width: widths[i],
    align: c.align,
    rich: true,
    style: fontSize === 8.2 ? undefined : { fontSize },
  }));
  return tableBlocks(`table:${table.id}`, columns, plainRows(table.rows), spaceBefore);
}

function checksTable(checks: Check[]): Block[] {
  const columns: Column<Check>[] = [
    {
      key: "severity",
      label: "Result",
      width: 68,
      cell: (c) => (
        <View style={{ paddingHorizontal: 4, paddingVertical: 3 }}>
          <SeverityBadge severity={c.severity} />
        </View>
      ),
    },
    {
      key: "title",
      label: "Check",
      cell: (c) => (
        <View style={{ paddingHorizontal: 4, paddingVertical: 2.3 }}>
          <Text style={{ fontSize: 8.2, fontWeight: 600 }}>{c.title}</Text>
          <Text style={{ fontSize: 8, color: colors.ink2, marginTop: 1 }}>{c.message}</Text>
        </View>
      ),
    },
    { key: "margin", label: "Margin", width: 52, align: "right", cell: (c) => formatMargin(c.margin) },
  ];
  return tableBlocks("checks", columns, plainRows(checks));
}

function legend(plot: LinePlot): ReactNode {
  return (
    <View style={{ flexDirection: "row", flexWrap: "wrap", justifyContent: "flex-end", width: contentWidth - 120 }}>
      {plot.series.map((ser, i) => {
        const st = seriesStyle(ser.role, i);
        return (
          <View key={i} style={{ flexDirection: "row", alignItems: "center", marginLeft: 10, maxWidth: contentWidth - 130 }}>
            <View style={{ width: 16, height: 0, borderTopWidth: st.width, borderTopColor: st.stroke, borderStyle: st.dash ? "dashed" : "solid", marginRight: 3 }} />
            <Text style={{ fontSize: 6.8, color: colors.ink2, maxWidth: contentWidth - 150 }}>{ser.name}</Text>
          </View>
        );
      })}
    </View>
  );
}

const CHART_HEIGHT = { line: 148, histogram: 140, levels: 170 } as const;

/** A figure: title, axis titles and legend around the vector chart. */
function figure(plot: Plot, n: number): ReactElement {
  const width = contentWidth;
  let yTitle: string;
  let xTitle = "";
  let legendEl: ReactNode = null;
  let chart: ReactNode;
  const height = CHART_HEIGHT[plot.kind];
  if (plot.kind === "line") {
    const u = lineAxisUnits(plot);
    yTitle = axisTitle(plot.y.label, u.y);
    xTitle = axisTitle(plot.x.label, u.x);
    legendEl = legend(plot);
    chart = <LinePlotChart plot={plot} width={width} height={height} />;
  } else if (plot.kind === "histogram") {
    yTitle = "Count";
    xTitle = axisTitle(plot.x.label, histogramAxisUnit(plot));
    chart = <HistogramChart plot={plot} width={width} height={height} />;
  } else {
    yTitle = axisTitle("Level", levelsAxisUnit(plot));
    chart = <LevelsChart plot={plot} width={width} height={height} />;
  }
  return (
    <View>
      <Text style={{ fontSize: 8.2, fontWeight: 600, marginBottom: 2 }}>
        <Text style={{ color: colors.copper }}>{`Figure ${n}  `}</Text>
        {plot.title}
      </Text>
      <View style={{ flexDirection: "row", justifyContent: "space-between", alignItems: "flex-end", marginBottom: 2 }}>
        <Text style={{ fontSize: 6.8, color: colors.ink2, width: 120, paddingRight: 12 }}>{yTitle}</Text>
        {legendEl}
      </View>
      {chart}
      {xTitle ? <Text style={{ fontSize: 6.8, color: colors.ink2, textAlign: "center", marginTop: 1 }}>{xTitle}</Text> : null}
    </View>
  );
}

function componentsTable(components: Component[]): Block[] {
  const columns: Column<Component>[] = [
    { key: "ref", label: "Ref.", width: 40, style: { fontWeight: 600 } },
    { key: "role", label: "Function" },
    { key: "display", label: "Value", width: 84, align: "right" },
    { key: "series", label: "Series", width: 46, cell: (c) => c.series || "—" },
    { key: "tolerance", label: "Tolerance", width: 56, align: "right", cell: (c) => formatTolerance(c.tolerance) },
  ];
  return tableBlocks("components", columns, plainRows(components));
}

function listItem(label: string, text: string): ReactElement {
  return (
    <View style={{ flexDirection: "row" }}>
      <Text style={{ width: 26, color: colors.copper, fontWeight: 600, fontSize: 8, paddingTop: 0.6, fontFeatureSettings: TABULAR }}>{label}</Text>
      <Text style={{ flexGrow: 1, flexShrink: 1, flexBasis: 0 }}>{text}</Text>
    </View>
  );
}

function revisionTable(rows: RevisionRow[]): Block[] {
  const columns: Column<RevisionRow>[] = [
    { key: "revision", label: "Rev.", width: 40, style: { fontWeight: 600 } },
    { key: "date", label: "Date", width: 66, style: { fontFeatureSettings: TABULAR } },
    { key: "description", label: "Description" },
    { key: "by", label: "By", width: 120 },
  ];
  return tableBlocks("revisions", columns, plainRows(rows));
}

function signOff(model: ReportModel): ReactElement {
  const cell = (role: string, p: { name: string; date: string }) => (
    <View style={{ flexGrow: 1, flexBasis: 0, marginRight: 10, borderTopWidth: 0.8, borderTopColor: colors.ink, paddingTop: 4 }}>
      <Text style={s.label}>{role}</Text>
      <Text style={{ fontSize: 9.4, fontWeight: 600, marginTop: 2 }}>{p.name}</Text>
      <Text style={[s.small, { fontFeatureSettings: TABULAR }]}>{p.date}</Text>
    </View>
  );
  return (
    <View>
      <View style={{ flexDirection: "row", marginRight: -10 }}>
        {cell("Prepared by", model.signOff.prepared)}
        {cell("Checked by", model.signOff.checked)}
        {cell("Approved by", model.signOff.approved)}
      </View>
      <Text style={[s.small, { marginTop: 8 }]}>
        {`Issued by ${model.workspace.name} on ${model.issueDate}. This file carries the digital signature of ${model.signer?.name ?? model.workspace.name}; any change to the file after issue invalidates the signature.`}
      </Text>
    </View>
  );
}

function verification(model: ReportModel): ReactElement {
  const row = (label: string, value: string, mono = false) => (
    <View style={{ flexDirection: "row", marginBottom: 1.6 }}>
      <Text style={{ width: 92, color: colors.muted, fontSize: 7.6 }}>{label}</Text>
      <Text style={[{ flexGrow: 1, flexShrink: 1, flexBasis: 0, fontSize: 7.6 }, mono ? s.mono : {}]}>{mono ? monoText(value) : value}</Text>
    </View>
  );
  return (
    <View style={{ flexDirection: "row", borderWidth: 0.6, borderColor: colors.rule, backgroundColor: colors.fillLight, paddingHorizontal: 8, paddingVertical: 6 }}>
      <View style={{ flexGrow: 1, flexShrink: 1, flexBasis: 0, paddingRight: 10 }}>
        <Text style={{ fontSize: 8.4, fontWeight: 600, marginBottom: 3 }}>Engine and verification</Text>
        {row("Engine version", `${model.engine.typeId}@${model.engine.version} (${model.calculation.typeTitle})`, true)}
        {row("Verification code", model.verification.code, true)}
        {row("Verify at", model.verification.url, true)}
        {model.signer ? row("Certificate SHA-256", formatFingerprint(model.signer.fingerprint), true) : null}
        <Text style={[s.small, { marginTop: 3 }]}>
          The verify page shows whether a file is exactly the report that was issued, and by whom.
        </Text>
      </View>
      <QrCode value={model.verification.url} sizePt={74} />
    </View>
  );
}

// --- the flow ---------------------------------------------------------------------------------

/** All blocks of the report, in reading order. */
export function reportBlocks(model: ReportModel): Block[] {
  const f = new Flow();
  f.add(cover(model), 0);

  f.section("Purpose and scope");
  f.subheading("Purpose", 2);
  f.paragraphs(model.purpose || "Not stated.");
  f.subheading("Scope");
  f.paragraphs(model.scope || "Not stated.");

  f.section("Inputs");
  f.addAll(inputsTable(model.inputs));

  if (model.formulas.length > 0) {
    f.section("Method and formulas");
    f.add(
      <Text style={[s.small, { marginBottom: 2 }]}>
        Each formula is printed as used: symbolic, then with the input values substituted, then its result, as computed by the engine.
      </Text>,
      0,
      { keepWithNext: true },
    );
    const widest = Math.max(24, ...model.formulas.map((x) => estimateTextWidth((splitEquation(x.symbolic).lhs || x.symbol).replace(/_/g, ""), 9.2)));
    const lhsWidth = Math.min(110, widest + 2);
    model.formulas.forEach((x, i) => f.add(formula(x, i + 1, lhsWidth), 0));
  }

  f.section("Results");
  f.addAll(resultsTable(model.results));
  for (const t of model.tables) {
    f.subheading(t.title, 12);
    f.addAll(freeTable(t, 0));
  }

  f.section("Checks");
  if (model.checks.length) f.addAll(checksTable(model.checks));
  else f.paragraphs("No checks apply to this calculation.");

  if (model.plots.length > 0) {
    f.section("Plots");
    model.plots.forEach((p, i) => {
      f.add(figure(p, i + 1), i === 0 ? 2 : 14);
    });
  }

  if (model.components.length > 0) {
    f.section("Components");
    f.addAll(componentsTable(model.components));
  }

  f.section("Assumptions, cautions and limits of use");
  f.subheading("Assumptions", 2);
  if (model.assumptions.length) model.assumptions.forEach((a, i) => f.add(listItem(`A${i + 1}`, a), i === 0 ? 0 : 3));
  else f.paragraphs("None stated.");
  f.subheading("Cautions");
  if (model.cautions.length) model.cautions.forEach((c, i) => f.add(listItem(`C${i + 1}`, c), i === 0 ? 0 : 3));
  else f.paragraphs("No safety cautions apply to this calculation type.");
  f.add(
    <View style={{ borderLeftWidth: 2, borderLeftColor: colors.copper, paddingLeft: 8, paddingVertical: 2 }}>
      <Text style={{ fontStyle: "italic" }}>{model.statement}</Text>
    </View>,
    10,
  );

  f.section("Revision history");
  f.addAll(revisionTable(model.revisions));

  f.section("Sign-off");
  f.add(signOff(model), 2);
  f.add(verification(model), 10);
  return f.blocks;
}
