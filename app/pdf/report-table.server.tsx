/**
 * A tabular report as a PDF (@react-pdf/renderer, Source Sans 3): compliance, expiries and
 * completions share it. Landscape, the header row repeated on every page, page numbers, the
 * generated date and the usual caution.
 */
import { Document, Page, renderToBuffer, StyleSheet, Text, View } from "@react-pdf/renderer";
import { CAUTION_TEXT } from "~/components/caution";
import type { ReportTable } from "~/routes/reports/report-tables";
import { drawableText, PDF_FONT_FAMILY, registerPdfFonts } from "./fonts.server";

const INK = "#17302E";
const MUTED = "#5B6B68";
const RULE = "#E3DCCF";

const s = StyleSheet.create({
  page: { fontFamily: PDF_FONT_FAMILY, fontSize: 8.5, color: INK, paddingTop: 32, paddingBottom: 40, paddingHorizontal: 32, lineHeight: 1.3 },
  org: { color: MUTED, fontSize: 8.5 },
  title: { fontSize: 15, fontWeight: 600, marginBottom: 4 },
  h2: { fontSize: 11, fontWeight: 600, marginTop: 10, marginBottom: 3 },
  head: { flexDirection: "row", borderBottomWidth: 0.8, borderBottomColor: MUTED, paddingVertical: 2 },
  row: { flexDirection: "row", borderBottomWidth: 0.5, borderBottomColor: RULE, paddingVertical: 2 },
  cell: { flex: 1, paddingRight: 4 },
  bold: { fontWeight: 600 },
  muted: { color: MUTED },
  caution: { marginTop: 12, borderTopWidth: 0.5, borderTopColor: RULE, paddingTop: 5, fontSize: 8 },
  footer: { position: "absolute", bottom: 18, left: 32, fontSize: 7.5, color: MUTED },
  pageNumber: { position: "absolute", bottom: 18, left: 32, right: 32, textAlign: "right", fontSize: 7.5, color: MUTED },
});

export type ReportPdfInput = {
  orgName: string;
  title: string;
  /** Lines under the title: the date or range, the scope, how it was counted. */
  lines: string[];
  sections: { heading: string; table: ReportTable; empty: string }[];
  /** The organisation's calendar date the PDF was made, and its zone. */
  generatedOn: string;
  timeZone: string;
};

function Table({ table }: { table: ReportTable }) {
  // The first column names the row (a unit, a date): it gets more room.
  const align = (i: number) => ({ ...(table.numeric.includes(i) ? { textAlign: "right" as const } : {}), ...(i === 0 ? { flex: 2 } : {}) });
  return (
    <View>
      <View style={s.head}>
        {table.header.map((h, i) => (
          <Text key={i} style={[s.cell, s.bold, align(i)]}>
            {h}
          </Text>
        ))}
      </View>
      {table.rows.map((r, j) => (
        <View key={j} style={s.row} wrap={false}>
          {r.map((v, i) => (
            <Text key={i} style={[s.cell, align(i)]}>
              {v}
            </Text>
          ))}
        </View>
      ))}
    </View>
  );
}

function Report({ d }: { d: ReportPdfInput }) {
  return (
    <Document title={d.title} author={d.orgName} subject={d.lines[0] ?? d.title}>
      <Page size="LETTER" orientation="landscape" style={s.page}>
        <Text style={s.org}>{d.orgName} · Tidemark report</Text>
        <Text style={s.title}>{d.title}</Text>
        {d.lines.map((l, i) => (
          <Text key={i}>{l}</Text>
        ))}
        {d.sections.map((sec, i) => (
          <View key={i}>
            <Text style={s.h2}>{sec.heading}</Text>
            {sec.table.rows.length === 0 ? <Text style={s.muted}>{sec.empty}</Text> : <Table table={sec.table} />}
          </View>
        ))}
        <Text style={s.caution} wrap={false}>
          Generated {d.generatedOn} ({d.timeZone}). Caution. {CAUTION_TEXT}
        </Text>
        <Text style={s.footer} fixed>
            Generated {d.generatedOn} ({d.timeZone}) · {d.title}
          </Text>
        <Text style={s.pageNumber} fixed render={({ pageNumber, totalPages }) => `Page ${pageNumber} of ${totalPages}`} />
      </Page>
    </Document>
  );
}

export async function renderReportPdf(input: ReportPdfInput): Promise<Buffer> {
  registerPdfFonts();
  return renderToBuffer(<Report d={drawableText(input)} />);
}
