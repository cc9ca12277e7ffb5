// The study report as a PDF, drawn on the server with @react-pdf/renderer from the same model as
// the printable page (lib/report/study-report.ts). Inter is embedded so the text can be copied and
// searched; the few signs the font's Latin subset lacks are spelled out (pdfText).
import { createRequire } from "node:module";
import { Document, Font, Line, Page, Path, Polyline, StyleSheet, Svg, Circle, Text, View, renderToBuffer } from "@react-pdf/renderer";
import type { ReportSection, StudyReportModel } from "../../lib/report/study-report";
import type { Night } from "../../lib/engine/nights";
import { NIGHT_STATUS_STYLE } from "../../shared/night-status";
import { formatUtc } from "../../shared/format";

const require = createRequire(import.meta.url);
let fontsRegistered = false;
function registerFonts() {
  if (fontsRegistered) return;
  Font.register({
    family: "Inter",
    fonts: [
      { src: require.resolve("@fontsource/inter/files/inter-latin-400-normal.woff"), fontWeight: 400 },
      { src: require.resolve("@fontsource/inter/files/inter-latin-700-normal.woff"), fontWeight: 700 },
    ],
  });
  // Whole words on one line: no hyphenation of figures and names.
  Font.registerHyphenationCallback((word) => [word]);
  fontsRegistered = true;
}

/** Signs outside the embedded font's Latin subset, spelled with ones it has. */
const SPELLED: [RegExp, string][] = [
  [/≥/g, ">="],
  [/≤/g, "<="],
  [/→/g, "->"],
  [/×/g, "x"],
  [/[◐●○]/g, ""],
];
export function pdfText(s: string): string {
  return SPELLED.reduce((text, [re, by]) => text.replace(re, by), s);
}

const INK = "#111827";
const MUTED = "#4b5563";
const RULE = "#d1d5db";
const VERDICT_COLOURS: Record<string, string> = { go: "#1f8a5c", marginal: "#a8860f", "no-go": "#b3323d", "insufficient-data": "#5b6688" };

const styles = StyleSheet.create({
  page: { fontFamily: "Inter", fontSize: 9, color: INK, padding: 36, lineHeight: 1.35 },
  h1: { fontSize: 16, fontWeight: 700 },
  subtitle: { color: MUTED, marginTop: 2, marginBottom: 8 },
  caution: { borderWidth: 1, borderColor: "#c9861a", backgroundColor: "#fdf4e3", padding: 6, marginBottom: 8 },
  h2: { fontSize: 11, fontWeight: 700, marginTop: 10, marginBottom: 4 },
  verdict: { fontSize: 13, fontWeight: 700 },
  row: { flexDirection: "row", borderBottomWidth: 0.5, borderBottomColor: RULE, paddingVertical: 1.5 },
  head: { fontWeight: 700 },
  label: { width: "38%", color: MUTED, paddingRight: 6 },
  value: { width: "62%" },
  note: { color: MUTED, marginTop: 3 },
  footer: { position: "absolute", bottom: 18, left: 36, right: 36, fontSize: 7, color: MUTED, flexDirection: "row", justifyContent: "space-between" },
});

function Facts({ rows }: { rows: [string, string][] }) {
  return (
    <View>
      {rows.map(([k, v]) => (
        <View key={k} style={styles.row} wrap={false}>
          <Text style={styles.label}>{pdfText(k)}</Text>
          <Text style={styles.value}>{pdfText(v)}</Text>
        </View>
      ))}
    </View>
  );
}

function Table({ columns, rows }: { columns: string[]; rows: string[][] }) {
  const width = `${100 / columns.length}%`;
  return (
    <View>
      <View style={[styles.row, styles.head]} fixed>
        {columns.map((c) => (
          <Text key={c} style={{ width, paddingRight: 4 }}>
            {pdfText(c)}
          </Text>
        ))}
      </View>
      {rows.map((r, i) => (
        <View key={i} style={styles.row} wrap={false}>
          {r.map((cell, j) => (
            <Text key={j} style={{ width, paddingRight: 4 }}>
              {pdfText(cell)}
            </Text>
          ))}
        </View>
      ))}
    </View>
  );
}

/**
 * Months as rows, days as columns; each status has its colour and its own mark (none, slash,
 * cross, ring). Drawn as one fill path and one mark path per status: a year is ~1,500 shapes,
 * and one SVG element per shape made the PDF several times slower to lay out.
 */
function NightGrid({ nights }: { nights: Night[] }) {
  const months = [...new Set(nights.map((n) => n.date.slice(0, 7)))];
  const cell = 12;
  const step = cell + 2;
  const left = 40;
  const fills = new Map<string, string[]>();
  const marks: Record<"partly" | "dark" | "unknown", string[]> = { partly: [], dark: [], unknown: [] };
  for (const n of nights) {
    const x = left + (Number(n.date.slice(8, 10)) - 1) * step;
    const y = months.indexOf(n.date.slice(0, 7)) * step;
    const parts = fills.get(n.status) ?? [];
    parts.push(`M${x} ${y}h${cell}v${cell}h${-cell}Z`);
    fills.set(n.status, parts);
    if (n.status === "partly") marks.partly.push(`M${x + 2} ${y + cell - 2}L${x + cell - 2} ${y + 2}`);
    if (n.status === "dark") marks.dark.push(`M${x + 2} ${y + 2}L${x + cell - 2} ${y + cell - 2}M${x + 2} ${y + cell - 2}L${x + cell - 2} ${y + 2}`);
    if (n.status === "unknown") marks.unknown.push(`M${x + 3} ${y + 3}h${cell - 6}v${cell - 6}h${-(cell - 6)}Z`);
  }
  return (
    <Svg width={left + 31 * step} height={months.length * step + 2}>
      {months.map((m, row) => (
        <Text key={m} x={0} y={row * step + cell - 2} style={{ fontSize: 7 }}>
          {m}
        </Text>
      ))}
      {[...fills].map(([status, parts]) => {
        const colour = NIGHT_STATUS_STYLE[status as Night["status"]].colour;
        return <Path key={status} d={parts.join("")} fill={colour === "transparent" ? "#ffffff" : colour} stroke="#9ca3af" strokeWidth={0.5} />;
      })}
      {marks.partly.length > 0 && <Path d={marks.partly.join("")} stroke={INK} strokeWidth={1} />}
      {marks.dark.length > 0 && <Path d={marks.dark.join("")} stroke="#ffffff" strokeWidth={1.2} />}
      {marks.unknown.length > 0 && <Path d={marks.unknown.join("")} fill="none" stroke="#ffffff" strokeWidth={1} />}
    </Svg>
  );
}

function Section({ section }: { section: ReportSection }) {
  return (
    <View>
      <Text style={styles.h2} minPresenceAhead={40}>
        {pdfText(section.heading)}
      </Text>
      {section.kind === "facts" && <Facts rows={section.rows} />}
      {section.kind === "table" && (section.rows.length ? <Table columns={section.columns} rows={section.rows} /> : null)}
      {section.kind === "list" && section.items.map((item) => <Text key={item}>• {pdfText(item)}</Text>)}
      {section.kind === "span" && (
        <View wrap={false}>
          <Svg width={section.drawing.width} height={section.drawing.height} viewBox={section.drawing.viewBox}>
            <Line x1={section.drawing.surface.x1} y1={section.drawing.surface.y} x2={section.drawing.surface.x2} y2={section.drawing.surface.y} stroke="#6b7280" strokeWidth={1} />
            <Line x1={section.drawing.supports.a.x} y1={section.drawing.supports.a.base} x2={section.drawing.supports.a.x} y2={section.drawing.supports.a.top} stroke={INK} strokeWidth={2} />
            <Line x1={section.drawing.supports.b.x} y1={section.drawing.supports.b.base} x2={section.drawing.supports.b.x} y2={section.drawing.supports.b.top} stroke={INK} strokeWidth={2} />
            <Polyline points={section.drawing.conductorPoints} fill="none" stroke={INK} strokeWidth={1} />
            {section.drawing.markers.map((m, i) => (
              <Circle key={i} cx={m.x} cy={m.y} r={3.5} fill="#e8590c" stroke={INK} strokeWidth={0.5} />
            ))}
          </Svg>
        </View>
      )}
      {section.kind === "nights" && (
        <View>
          <NightGrid nights={section.nights} />
          <Text style={styles.note}>
            Key: plain green = lit all night; yellow with a slash = partly dark; red with a cross = dark; grey with a white square = unknown; white = no required time.
          </Text>
          {section.exceptions.length > 0 && (
            <View style={{ marginTop: 4 }}>
              <Table columns={["Night of", "Status", "Dark min", "Unknown min", "Required min"]} rows={section.exceptions} />
            </View>
          )}
        </View>
      )}
      {"note" in section && section.note && <Text style={styles.note}>{pdfText(section.note)}</Text>}
    </View>
  );
}

export function ReportDocument({ model }: { model: StudyReportModel }) {
  return (
    <Document title={pdfText(model.title)} author="Duskline" subject="Feasibility report" creator="Duskline" producer="Duskline">
      <Page size="A4" style={styles.page}>
        <Text style={styles.h1}>{pdfText(model.title)}</Text>
        <Text style={styles.subtitle}>{pdfText(`${model.subtitle} · generated ${formatUtc(model.generatedAt)}`)}</Text>
        <View style={styles.caution}>
          <Text>{pdfText(model.caution)}</Text>
          <Text style={{ marginTop: 2 }}>{pdfText(model.deference)}</Text>
        </View>
        <Text style={[styles.verdict, { color: VERDICT_COLOURS[model.verdict.status] }]}>Verdict: {model.verdict.word}</Text>
        <Text style={styles.note}>{pdfText(`Judged on ${model.verdict.basis}.`)}</Text>
        {model.verdict.reasons.map((r) => (
          <Text key={r}>• {pdfText(r)}</Text>
        ))}
        {model.sections.map((s, i) => (
          <Section key={i} section={s} />
        ))}
        <View style={styles.footer} fixed>
          <Text>{pdfText(model.caution.split(".")[0])}. Defers to local codes, the aviation authority and licensed engineering practice.</Text>
          <Text render={({ pageNumber, totalPages }) => `${pageNumber} / ${totalPages}`} />
        </View>
      </Page>
    </Document>
  );
}

/**
 * Lays the report out as PDF bytes on the calling thread: about a second of CPU for a year's
 * report. The server calls it on a worker thread (app/services/report-pdf.worker.mjs through
 * renderReportPdfOffThread), never on the thread that serves requests.
 */
export function renderReportPdf(model: StudyReportModel): Promise<Buffer> {
  registerFonts();
  return renderToBuffer(<ReportDocument model={model} />);
}
