/**
 * The check-off record as a PDF (@react-pdf/renderer): every step, comment, signature (printed
 * name with credentials, date and time with the time zone, meaning — US 21 CFR Part 11 §11.50,
 * which asks for them in every human-readable form, paper included), every addendum and the caution.
 */
import { Document, Page, renderToBuffer, StyleSheet, Text, View } from "@react-pdf/renderer";
import { CAUTION_TEXT } from "~/components/caution";
import type { RecordViewData } from "~/components/checkoffs/record-view";
import { checkoffStatusWord } from "~/components/checkoffs/checkoff-status";
import type { SignatureView } from "~/components/checkoffs/signature-block";
import { methodLabel } from "~/domain/checkoffs/methods";
import { manifestSignature, OUTCOME_WORDS, RESULT_WORDS } from "~/domain/checkoffs/record";
import { drawableText, PDF_FONT_FAMILY, registerPdfFonts } from "./fonts.server";

const INK = "#17302E";
const MUTED = "#5B6B68";
const RULE = "#E3DCCF";
const SEA = "#0F5C57";

const s = StyleSheet.create({
  page: { fontFamily: PDF_FONT_FAMILY, fontSize: 10, color: INK, padding: 36, lineHeight: 1.4 },
  org: { color: MUTED, fontSize: 9 },
  title: { fontSize: 16, fontWeight: 600, marginBottom: 6 },
  h2: { fontSize: 12, fontWeight: 600, marginTop: 12, marginBottom: 4 },
  row: { flexDirection: "row", borderBottomWidth: 0.5, borderBottomColor: RULE, paddingVertical: 3 },
  num: { width: 20 },
  step: { flex: 3, paddingRight: 6 },
  result: { width: 70 },
  comment: { flex: 2 },
  bold: { fontWeight: 600 },
  muted: { color: MUTED },
  sig: { borderWidth: 0.5, borderColor: RULE, padding: 6, marginBottom: 4 },
  addendum: { borderLeftWidth: 2, borderLeftColor: SEA, paddingLeft: 6, marginBottom: 6 },
  caution: { marginTop: 14, borderTopWidth: 0.5, borderTopColor: RULE, paddingTop: 6, fontSize: 8.5 },
});

function Signature({ sig, holds }: { sig: SignatureView; holds: boolean | undefined }) {
  const m = manifestSignature(sig);
  return (
    <View style={s.sig} wrap={false}>
      <Text style={s.bold}>{m.name}</Text>
      <Text>Signed {m.when}</Text>
      <Text>Meaning: {m.meaning}</Text>
      <Text style={s.muted}>
        {sig.method === "shared-device" ? "Shared device, e-mail and signing PIN" : "Own session and signing PIN"} · content {sig.contentHash}
        {holds === false ? " · DOES NOT MATCH THE RECORD" : ""}
      </Text>
    </View>
  );
}

function Record({ d }: { d: RecordViewData }) {
  const marks = new Map(d.marks.map((m) => [m.stepIndex, m]));
  return (
    <Document title={`Check-off record: ${d.checklist.title}`} author={d.orgName} subject={`${d.person.name} — ${d.checklist.skill}`}>
      <Page size="LETTER" style={s.page}>
        <Text style={s.org}>{d.orgName} · Check-off record</Text>
        <Text style={s.title}>{d.checklist.title}</Text>
        <Text>Therapist: {d.person.credentialLetters ? `${d.person.name}, ${d.person.credentialLetters}` : d.person.name}</Text>
        <Text>Preceptor: {d.preceptor?.name ?? "—"}</Text>
        <Text>
          Skill: {d.checklist.skill} · Method: {methodLabel(d.checklist.method)} · Checklist version {d.checklist.version}
        </Text>
        <Text>
          Status: {checkoffStatusWord(d.checkoff.status)} · Outcome: {d.checkoff.outcome ? OUTCOME_WORDS[d.checkoff.outcome] : "Not decided"}
        </Text>
        {d.checkoff.outcome === "needs-practice" ? (
          <Text>
            Practice plan: {d.checkoff.practicePlan} — by {d.checkoff.practiceBy}
          </Text>
        ) : null}
        {d.checkoff.contentHash ? <Text style={s.muted}>Content hash: {d.checkoff.contentHash}</Text> : null}

        <Text style={s.h2}>Steps</Text>
        {d.checklist.steps.map((step, i) => {
          const mark = marks.get(i);
          return (
            <View key={i} style={s.row} wrap={false}>
              <Text style={s.num}>{i + 1}</Text>
              <Text style={s.step}>
                {step.text}
                {step.critical ? " (critical)" : ""}
              </Text>
              <Text style={[s.result, s.bold]}>{mark ? RESULT_WORDS[mark.result] : "Not marked"}</Text>
              <Text style={s.comment}>{mark?.comment ?? ""}</Text>
            </View>
          );
        })}

        <Text style={s.h2}>Signatures</Text>
        {d.signatures.length === 0 ? <Text>Not signed.</Text> : d.signatures.map((sig) => <Signature key={sig.id} sig={sig} holds={d.holds[sig.id]} />)}

        <Text style={s.h2}>Addenda</Text>
        {d.addenda.length === 0 ? <Text>None.</Text> : null}
        {d.addenda.map((a) => (
          <View key={a.id} style={s.addendum}>
            <Text>{a.text}</Text>
            {a.signature ? <Signature sig={a.signature} holds={d.holds[a.signature.id]} /> : null}
          </View>
        ))}

        {d.evidence.length > 0 ? (
          <>
            <Text style={s.h2}>Evidence attached</Text>
            {d.evidence.map((e) => (
              <Text key={e.id}>• {e.name}</Text>
            ))}
          </>
        ) : null}

        <Text style={s.h2}>References</Text>
        <Text>{d.checklist.references}</Text>
        <Text style={s.caution}>Caution. {CAUTION_TEXT}</Text>
      </Page>
    </Document>
  );
}

export async function renderCheckoffRecordPdf(d: RecordViewData): Promise<Buffer> {
  registerPdfFonts();
  return renderToBuffer(<Record d={drawableText(d)} />);
}
