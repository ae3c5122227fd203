/**
 * A certificate as a one-page PDF (@react-pdf/renderer, Source Sans 3): the person, what was met,
 * the dates, the organisation, the signer, the verification code and a QR code of the public
 * verification address, and the caution. The QR code is drawn by `qrcode` as a PNG; its error
 * correction level M survives a printed-and-photographed copy (ISO/IEC 18004: about 15 % of the
 * code words recoverable — from memory).
 */
import { Document, Image, Page, renderToBuffer, StyleSheet, Text, View } from "@react-pdf/renderer";
import QRCode from "qrcode";
import { CAUTION_TEXT } from "~/components/caution";
import { formatLongCalendarDate } from "~/components/calendar-date";
import type { IsoDate } from "~/domain/status";
import { drawableText, PDF_FONT_FAMILY, registerPdfFonts } from "./fonts.server";

/** '2026-12-02' → "2 December 2026" (no weekday on a certificate). */
const longDate = (d: IsoDate) => formatLongCalendarDate(d).replace(/^\S+ /, "");

const INK = "#17302E";
const MUTED = "#5B6B68";
const RULE = "#E3DCCF";
const SEA = "#0F5C57";

const s = StyleSheet.create({
  page: { fontFamily: PDF_FONT_FAMILY, fontSize: 11, color: INK, padding: 54, lineHeight: 1.4 },
  frame: { borderWidth: 1.5, borderColor: SEA, padding: 36, flexGrow: 1 },
  org: { color: MUTED, fontSize: 11, textAlign: "center" },
  kind: { fontSize: 13, textAlign: "center", marginTop: 28, color: SEA, fontWeight: 600 },
  certifies: { textAlign: "center", marginTop: 24, color: MUTED },
  name: { fontSize: 26, fontWeight: 600, textAlign: "center", marginTop: 6 },
  met: { textAlign: "center", marginTop: 18, color: MUTED },
  title: { fontSize: 16, fontWeight: 600, textAlign: "center", marginTop: 6 },
  dates: { flexDirection: "row", justifyContent: "center", marginTop: 28 },
  date: { width: 190, textAlign: "center" },
  label: { color: MUTED, fontSize: 9 },
  signer: { marginTop: 36, alignSelf: "center", width: 260, borderTopWidth: 0.75, borderTopColor: INK, paddingTop: 4, textAlign: "center" },
  verify: { flexDirection: "row", marginTop: 36, alignItems: "center", borderTopWidth: 0.5, borderTopColor: RULE, paddingTop: 14 },
  qr: { width: 108, height: 108 },
  verifyText: { marginLeft: 16, flex: 1 },
  code: { fontSize: 15, fontWeight: 600, letterSpacing: 1 },
  caution: { marginTop: 18, borderTopWidth: 0.5, borderTopColor: RULE, paddingTop: 6, fontSize: 8.5, color: MUTED },
});

export type CertificatePdfData = {
  orgName: string;
  personName: string;
  title: string;
  sourceType: "attempt" | "checkoff";
  issuedOn: IsoDate;
  validThrough: IsoDate | null;
  signerName: string;
  code: string;
  verifyUrl: string;
  revoked: boolean;
};

/** The address printed on a certificate and held in its QR code. */
export function verificationUrl(publicUrl: string, code: string): string {
  return `${publicUrl.replace(/\/$/, "")}/verify/${encodeURIComponent(code)}`;
}

function Certificate({ d, qr }: { d: CertificatePdfData; qr: string }) {
  return (
    <Document title={`Certificate: ${d.title}`} author={d.orgName} subject={`${d.personName} — ${d.title}`}>
      <Page size="LETTER" style={s.page}>
        <View style={s.frame}>
          <Text style={s.org}>{d.orgName}</Text>
          <Text style={s.kind}>{d.sourceType === "attempt" ? "Certificate of completion" : "Certificate of competence"}</Text>
          {d.revoked ? <Text style={[s.kind, { color: "#9C2F1E" }]}>REVOKED — see the verification address</Text> : null}
          <Text style={s.certifies}>This certifies that</Text>
          <Text style={s.name}>{d.personName}</Text>
          <Text style={s.met}>{d.sourceType === "attempt" ? "passed the exam" : "was observed and judged competent in"}</Text>
          <Text style={s.title}>{d.title}</Text>
          <View style={s.dates}>
            <View style={s.date}>
              <Text style={s.label}>Issued</Text>
              <Text>{longDate(d.issuedOn)}</Text>
            </View>
            <View style={s.date}>
              <Text style={s.label}>Valid through</Text>
              <Text>{d.validThrough ? longDate(d.validThrough) : "No expiry"}</Text>
            </View>
          </View>
          <View style={s.signer}>
            <Text>{d.signerName}</Text>
            <Text style={s.label}>{d.sourceType === "attempt" ? "Education lead" : "Preceptor"}</Text>
          </View>
          <View style={s.verify}>
            <Image style={s.qr} src={qr} />
            <View style={s.verifyText}>
              <Text style={s.label}>Verification code</Text>
              <Text style={s.code}>{d.code}</Text>
              <Text style={[s.label, { marginTop: 6 }]}>Check that this certificate is valid at</Text>
              <Text>{d.verifyUrl}</Text>
            </View>
          </View>
          <Text style={s.caution}>Caution. This certificate is an educational record. {CAUTION_TEXT}</Text>
        </View>
      </Page>
    </Document>
  );
}

export async function renderCertificatePdf(d: CertificatePdfData): Promise<Buffer> {
  registerPdfFonts();
  const qr = await QRCode.toDataURL(d.verifyUrl, { errorCorrectionLevel: "M", margin: 2, scale: 8 });
  return renderToBuffer(<Certificate d={drawableText(d)} qr={qr} />);
}
