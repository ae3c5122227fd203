/**
 * The item analysis on one page (@react-pdf/renderer), for an education committee: the summary
 * numbers, the band around the pass mark, the flagged items with their flags, and the caution.
 * One page by construction: at most MAX_FLAGGED flagged items are listed (the rest are counted
 * and left to the CSV), and stems are cut to one line.
 */
import { Document, Page, renderToBuffer, StyleSheet, Text, View } from "@react-pdf/renderer";
import type { ItemAnalysisView } from "~/db/queries/item-analysis.server";
import { FLAG_TEXT } from "~/domain/psychometrics/form-analysis";
import { drawableText, PDF_FONT_FAMILY, registerPdfFonts } from "./fonts.server";

const INK = "#17302E";
const MUTED = "#5B6B68";
const RULE = "#E3DCCF";

/** How many flagged items fit on the page with the summary. */
export const MAX_FLAGGED = 14;

/** The caution line of this report: statistics guide, they do not decide. */
export const ANALYSIS_CAUTION =
  "For educational use. These statistics help an education committee review items; they do not decide on their own whether an item or a score is right. Follow local policy.";

const s = StyleSheet.create({
  page: { fontFamily: PDF_FONT_FAMILY, fontSize: 9, color: INK, padding: 32, lineHeight: 1.35 },
  org: { color: MUTED, fontSize: 8.5 },
  title: { fontSize: 15, fontWeight: 600, marginBottom: 4 },
  h2: { fontSize: 11, fontWeight: 600, marginTop: 10, marginBottom: 3 },
  grid: { flexDirection: "row", flexWrap: "wrap" },
  cell: { width: "33%", paddingVertical: 1 },
  bold: { fontWeight: 600 },
  muted: { color: MUTED },
  row: { flexDirection: "row", borderBottomWidth: 0.5, borderBottomColor: RULE, paddingVertical: 2.5 },
  head: { flexDirection: "row", borderBottomWidth: 0.8, borderBottomColor: MUTED, paddingVertical: 2 },
  stem: { flex: 1, paddingRight: 6 },
  num: { width: 38, textAlign: "right" },
  flags: { width: 170, paddingLeft: 8 },
  caution: { marginTop: 12, borderTopWidth: 0.5, borderTopColor: RULE, paddingTop: 5, fontSize: 8 },
});

const fixed = (n: number | null, digits = 2) => (n === null ? "—" : n.toFixed(digits));
const oneLine = (text: string, max = 70) => (text.length <= max ? text : `${text.slice(0, max - 1).trimEnd()}…`);

function Report({ a, orgName }: { a: ItemAnalysisView; orgName: string }) {
  const flagged = a.items.filter((i) => i.flags.length > 0);
  const shown = flagged.slice(0, MAX_FLAGGED);
  const sm = a.summary;
  return (
    <Document title={`Item analysis: ${a.exam.title}`} author={orgName} subject={`Version ${a.version.version}`}>
      <Page size="LETTER" style={s.page}>
        <Text style={s.org}>{orgName} · Item analysis</Text>
        <Text style={s.title}>{a.exam.title}</Text>
        <Text>
          Version {a.version.version}
          {a.version.live ? " (live)" : ""} · pass mark {a.version.passMarkPercent} % · {a.examinees} examinees (first sittings)
          {a.retakesExcluded ? ` · ${a.retakesExcluded} retakes not analysed` : ""}
          {sm.method === "random-forms" ? " · forms drawn at random from the blueprint" : " · one form for all"}
        </Text>
        {a.smallSample ? <Text style={s.bold}>Few examinees (fewer than 30): read these numbers as a first look.</Text> : null}

        <Text style={s.h2}>Summary</Text>
        <View style={s.grid}>
          <Text style={s.cell}>
            Mean: {fixed(sm.mean)} of {sm.formLength ?? "—"} items{sm.meanPercent !== null ? ` (${sm.meanPercent.toFixed(1)} %)` : ""}
          </Text>
          <Text style={s.cell}>SD: {fixed(sm.sd)} items</Text>
          <Text style={s.cell}>Variance: {sm.varianceKind === "population" ? "divisor N (population)" : "divisor N − 1 (sample)"}</Text>
          <Text style={s.cell}>
            KR-20: {fixed(sm.kr20, 3)}
            {sm.method === "random-forms" ? " (average drawn form)" : ""}
          </Text>
          <Text style={s.cell}>KR-21: {fixed(sm.kr21, 3)}</Text>
          <Text style={s.cell}>SEM: {fixed(sm.sem)} items</Text>
        </View>
        {a.passBand ? (
          <Text>
            One SEM around the pass mark ({a.passBand.cut.toFixed(1)} items): {a.passBand.low.toFixed(1)} to {a.passBand.high.toFixed(1)} items ({a.passBand.lowPercent.toFixed(1)} % to{" "}
            {a.passBand.highPercent.toFixed(1)} %); {a.passBand.inside} examinees scored inside this band.
          </Text>
        ) : null}

        <Text style={s.h2}>
          Flagged items ({flagged.length} of {a.items.length})
        </Text>
        {flagged.length === 0 ? (
          <Text>No item is flagged.</Text>
        ) : (
          <View>
            <View style={s.head}>
              <Text style={[s.stem, s.bold]}>Item</Text>
              <Text style={[s.num, s.bold]}>n</Text>
              <Text style={[s.num, s.bold]}>p</Text>
              <Text style={[s.num, s.bold]}>r corr.</Text>
              <Text style={[s.num, s.bold]}>D</Text>
              <Text style={[s.flags, s.bold]}>Flags</Text>
            </View>
            {shown.map((i) => (
              <View key={i.itemId} style={s.row} wrap={false}>
                <Text style={s.stem}>{oneLine(i.stemStart)}</Text>
                <Text style={s.num}>{i.seenBy}</Text>
                <Text style={s.num}>{fixed(i.p)}</Text>
                <Text style={s.num}>{fixed(i.correctedPointBiserial)}</Text>
                <Text style={s.num}>{fixed(i.discrimination)}</Text>
                <Text style={s.flags}>{i.flags.map((f) => FLAG_TEXT[f].label).join(", ")}</Text>
              </View>
            ))}
            {flagged.length > shown.length ? <Text style={s.muted}>… and {flagged.length - shown.length} more flagged items: see the CSV or the page.</Text> : null}
          </View>
        )}
        <Text style={[s.muted, { marginTop: 6 }]}>
          p: share right. r corr.: corrected point-biserial (item against the rest of the form). D: upper minus lower 27 % group share right. Flags (common practice, no source): p above
          0.90 or below 0.30; r below 0.20 (weak) or 0 (negative); a wrong option nobody chose (from 10 wrong answers). n below 20: read with care.
        </Text>
        <Text style={s.caution}>Caution. {ANALYSIS_CAUTION}</Text>
      </Page>
    </Document>
  );
}

export async function renderItemAnalysisPdf(a: ItemAnalysisView, orgName: string): Promise<Buffer> {
  registerPdfFonts();
  return renderToBuffer(<Report a={drawableText(a)} orgName={drawableText(orgName)} />);
}
