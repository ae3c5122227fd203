/**
 * The survey evidence packet as a PDF (@react-pdf/renderer, Source Sans 3): one section per
 * person, each starting on a new page — who they are, every requirement with its status word and
 * date, the evidence behind it (credential number, issuer, dates, who verified it and how; exam
 * attempts with score and date; check-offs with method, assessor, outcome and each signature's
 * printed name, date and time, and meaning — US 21 CFR Part 11 §11.50), then their certificates.
 */
import { Document, Page, renderToBuffer, StyleSheet, Text, View } from "@react-pdf/renderer";
import { CAUTION_TEXT } from "~/components/caution";
import { STATUS_WORDS } from "~/components/ui/status-mark";
import type { Packet, PacketPerson, PacketRequirement } from "~/db/queries/report-packet.server";
import { CERTIFICATE_STATE_WORDS } from "~/domain/certificates/certificate";
import { OUTCOME_WORDS } from "~/domain/checkoffs/record";
import { drawableText, PDF_FONT_FAMILY, registerPdfFonts } from "./fonts.server";

const INK = "#17302E";
const MUTED = "#5B6B68";
const RULE = "#E3DCCF";
const SEA = "#0F5C57";

const s = StyleSheet.create({
  page: { fontFamily: PDF_FONT_FAMILY, fontSize: 9, color: INK, paddingTop: 32, paddingBottom: 42, paddingHorizontal: 36, lineHeight: 1.35 },
  org: { color: MUTED, fontSize: 8.5 },
  title: { fontSize: 15, fontWeight: 600, marginBottom: 4 },
  h2: { fontSize: 11.5, fontWeight: 600, marginTop: 10, marginBottom: 3 },
  req: { borderBottomWidth: 0.5, borderBottomColor: RULE, paddingVertical: 4 },
  reqHead: { flexDirection: "row", justifyContent: "space-between" },
  evidence: { borderLeftWidth: 1.5, borderLeftColor: SEA, paddingLeft: 6, marginTop: 2 },
  bold: { fontWeight: 600 },
  muted: { color: MUTED },
  caution: { marginTop: 12, borderTopWidth: 0.5, borderTopColor: RULE, paddingTop: 5, fontSize: 8 },
  footer: { position: "absolute", bottom: 18, left: 36, fontSize: 7.5, color: MUTED },
  pageNumber: { position: "absolute", bottom: 18, left: 36, right: 36, textAlign: "right", fontSize: 7.5, color: MUTED },
});

const KIND = { exam: "Exam", checklist: "Check-off", credential: "Credential" } as const;
const dash = (v: string | null | undefined) => (v ? v : "—");

function statusLine(r: PacketRequirement): string {
  const word = STATUS_WORDS[r.status];
  if (r.waivedThrough) return `${word} through ${r.waivedThrough}`;
  if (r.date === null) return word;
  const date = r.dateMeaning === "due" ? `due ${r.extendedTo ?? r.date}${r.extendedTo ? ` (extended from ${r.date})` : ""}` : `valid through ${r.date}`;
  return `${word} · ${date}`;
}

function Requirement({ r }: { r: PacketRequirement }) {
  const nothing = r.credentials.length === 0 && r.attempts.length === 0 && r.checkoffs.length === 0;
  return (
    <View style={s.req} wrap={false}>
      <View style={s.reqHead}>
        <Text style={s.bold}>
          {r.title} <Text style={s.muted}>({KIND[r.kind]})</Text>
        </Text>
        <Text style={s.bold}>{statusLine(r)}</Text>
      </View>
      {r.credentials.map((c, i) => (
        <View key={`c${i}`} style={s.evidence}>
          <Text>
            {c.typeName} · number {dash(c.number)} · issuer {dash(c.issuer)} · issued {c.issuedOn} · {c.validThrough ? `valid through ${c.validThrough}` : "no expiry"}
          </Text>
          <Text style={s.muted}>
            {c.verifiedBy ? `Verified by ${c.verifiedBy} on ${dash(c.verifiedOn)}${c.verificationMethod ? ` (${c.verificationMethod})` : ""}` : "Not verified yet"}
          </Text>
        </View>
      ))}
      {r.attempts.map((a, i) => (
        <View key={`a${i}`} style={s.evidence}>
          <Text>
            Exam attempt: {a.exam} (version {a.version}) · {dash(a.on)} · score {a.scorePercent === null ? "—" : `${a.scorePercent.toFixed(1)} %`} · {a.passed ? "passed" : "not passed"}
          </Text>
        </View>
      ))}
      {r.checkoffs.map((c, i) => (
        <View key={`k${i}`} style={s.evidence}>
          <Text>
            Check-off: {c.checklist} (version {c.version}) · method {c.method} · assessor {dash(c.assessor)} · outcome {c.outcome ? OUTCOME_WORDS[c.outcome as keyof typeof OUTCOME_WORDS] : "—"} ·
            signed {dash(c.signedOn)}
          </Text>
          {c.signatures.map((sig, j) => (
            <Text key={j} style={s.muted}>
              Signature: {sig.name} · {sig.when} · {sig.meaning}
            </Text>
          ))}
        </View>
      ))}
      {r.waivers.map((w, i) => (
        <Text key={`w${i}`} style={s.evidence}>
          Waiver through {w.endsOn}: {w.reason}
        </Text>
      ))}
      {r.extensions.map((e, i) => (
        <Text key={`e${i}`} style={s.evidence}>
          Extension to {e.newDueOn}: {e.reason}
        </Text>
      ))}
      {nothing && r.waivers.length === 0 ? <Text style={s.muted}>No evidence recorded.</Text> : null}
    </View>
  );
}

function Person({ p, orgName, subject }: { p: PacketPerson; orgName: string; subject: string }) {
  return (
    <View>
      <Text style={s.org}>
        {orgName} · Survey evidence packet · {subject}
      </Text>
      <Text style={s.title}>{p.credentialLetters ? `${p.name}, ${p.credentialLetters}` : p.name}</Text>
      <Text>
        Employee id {dash(p.employeeId)} · {dash(p.title)} · home unit {dash(p.homeUnit)} · hired {dash(p.hireDate)}
        {p.active ? "" : " · deactivated"}
      </Text>
      <Text style={s.h2}>Requirements ({p.requirements.length})</Text>
      {p.requirements.length === 0 ? <Text style={s.muted}>No requirement applies.</Text> : p.requirements.map((r, i) => <Requirement key={i} r={r} />)}
      <Text style={s.h2}>Certificates ({p.certificates.length})</Text>
      {p.certificates.length === 0 ? <Text style={s.muted}>No certificates issued.</Text> : null}
      {p.certificates.map((c) => (
        <View key={c.id} style={s.req} wrap={false}>
          <Text>
            {c.title} · issued {c.issuedOn} · {c.validThrough ? `valid through ${c.validThrough}` : "no expiry"} · signed by {c.signerName} · code {c.code} · {CERTIFICATE_STATE_WORDS[c.state]}
            {c.revokedReason ? ` (${c.revokedReason})` : ""}
          </Text>
        </View>
      ))}
    </View>
  );
}

function PacketDocument({ packet, orgName, generatedOn, timeZone }: { packet: Packet; orgName: string; generatedOn: string; timeZone: string }) {
  // One <Page> per person: each starts on a fresh page with its own footer and caution.
  const pages = packet.people.length === 0 ? [null] : packet.people;
  return (
    <Document title={`Survey evidence packet: ${packet.subject}`} author={orgName} subject={packet.subject}>
      {pages.map((p, i) => (
        <Page key={p?.id ?? i} size="LETTER" style={s.page}>
          {p ? (
            <Person p={p} orgName={orgName} subject={packet.subject} />
          ) : (
            <View>
              <Text style={s.title}>Survey evidence packet: {packet.subject}</Text>
              <Text>No active people on this unit.</Text>
            </View>
          )}
          <Text style={s.caution} wrap={false}>
            Generated {generatedOn} ({timeZone}); statuses are as of that day. Caution. {CAUTION_TEXT}
          </Text>
          <Text style={s.footer} fixed>
            Generated {generatedOn} ({timeZone}) · {orgName}
          </Text>
          <Text style={s.pageNumber} fixed render={({ pageNumber }) => `Page ${pageNumber}`} />
        </Page>
      ))}
    </Document>
  );
}

export async function renderSurveyPacketPdf(packet: Packet, orgName: string, generatedOn: string, timeZone: string): Promise<Buffer> {
  registerPdfFonts();
  return renderToBuffer(<PacketDocument packet={drawableText(packet)} orgName={drawableText(orgName)} generatedOn={generatedOn} timeZone={timeZone} />);
}
