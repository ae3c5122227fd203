import { manifestSignature } from "~/domain/checkoffs/record";

export type SignatureView = {
  id: string;
  printedName: string;
  credentialLetters: string | null;
  signedAt: Date | string | number;
  timeZone: string;
  meaning: string;
  method: "own-session" | "shared-device";
  contentHash: string;
};

/**
 * A signature as people read it, on screen and on paper: printed name with credential letters,
 * date and time with the organisation's time zone, and meaning (US 21 CFR Part 11 §11.50(a)),
 * plus the start of the content hash it is bound to (§11.70) and whether it still matches.
 */
export function SignatureBlock({ signature, holds }: { signature: SignatureView; holds?: boolean }) {
  const m = manifestSignature(signature);
  return (
    <div className="rounded-md border border-rule bg-card px-4 py-3" data-testid="signature">
      <p className="text-lg font-semibold">{m.name}</p>
      <p>
        <span className="text-muted">Signed </span>
        <time dateTime={new Date(signature.signedAt).toISOString()}>{m.when}</time>
      </p>
      <p>
        <span className="text-muted">Meaning: </span>
        <strong className="font-semibold">{m.meaning}</strong>
      </p>
      <p className="text-sm text-muted">
        {signature.method === "shared-device" ? "Signed on a shared device (e-mail and signing PIN)" : "Signed in own session with signing PIN"} · content{" "}
        <code className="font-mono">{signature.contentHash.slice(0, 16)}…</code>
        {holds === undefined ? null : holds ? " · matches the record" : <strong className="font-semibold text-coral"> · does NOT match the record</strong>}
      </p>
    </div>
  );
}
