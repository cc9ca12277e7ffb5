// The study report as a PDF, drawn on the server with @react-pdf/renderer from the same model as
// the printable page (lib/report/study-report.ts). Inter is embedded so the text can be copied and
// searched; the few signs the font's Latin subset lacks are spelled out (pdfText).
import { createRequire } from "node:module";
import { Document, Font, G, Line, Page, Polyline, Rect, StyleSheet, Svg, Circle, Text, View, renderToBuffer } from "@react-pdf/renderer";
import type { ReportSection, StudyReportModel } from "../../lib/report/study-report";
import type { Night } from "../../lib/engine/nights";
import { NIGHT_STATUS_STYLE } from "../../shared/night-status";

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

/** Months as rows, days as columns; each status has its colour and its own mark (none, slash, cross, ring). */
function NightGrid({ nights }: { nights: Night[] }) {
  const months = [...new Set(nights.map((n) => n.date.slice(0, 7)))];
  const cell = 12;
  const left = 40;
  const height = months.length * (cell + 2) + 2;
  return (
    <Svg width={left + 31 * (cell + 2)} height={height}>
      {months.map((m, row) => (
        <Text key={m} x={0} y={row * (cell + 2) + cell - 2} style={{ fontSize: 7 }}>
          {m}
        </Text>
      ))}
      {nights.map((n) => {
        const row = months.indexOf(n.date.slice(0, 7));
        const x = left + (Number(n.date.slice(8, 10)) - 1) * (cell + 2);
        const y = row * (cell + 2);
        const style = NIGHT_STATUS_STYLE[n.status];
        const fill = style.colour === "transparent" ? "#ffffff" : style.colour;
        return (
          <G key={n.date}>
            <Rect x={x} y={y} width={cell} height={cell} fill={fill} stroke="#9ca3af" strokeWidth={0.5} />
            {n.status === "partly" && <Line x1={x + 2} y1={y + cell - 2} x2={x + cell - 2} y2={y + 2} stroke={INK} strokeWidth={1} />}
            {n.status === "dark" && (
              <>
                <Line x1={x + 2} y1={y + 2} x2={x + cell - 2} y2={y + cell - 2} stroke="#ffffff" strokeWidth={1.2} />
                <Line x1={x + 2} y1={y + cell - 2} x2={x + cell - 2} y2={y + 2} stroke="#ffffff" strokeWidth={1.2} />
              </>
            )}
            {n.status === "unknown" && <Circle cx={x + cell / 2} cy={y + cell / 2} r={3} fill="none" stroke="#ffffff" strokeWidth={1} />}
          </G>
        );
      })}
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
            Key: plain green = lit all night; yellow with a slash = partly dark; red with a cross = dark; grey with a ring = unknown; white = no required time.
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
        <Text style={styles.subtitle}>{pdfText(model.subtitle)}</Text>
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

export async function renderReportPdf(model: StudyReportModel): Promise<Buffer> {
  registerFonts();
  return renderToBuffer(<ReportDocument model={model} />);
}
