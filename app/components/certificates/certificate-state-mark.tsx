/**
 * A certificate's state as a word plus a shape, never colour alone (as StatusMark does for statuses):
 * valid a filled circle, expired an open circle with a bar, revoked a circle with a cross.
 */
import { CERTIFICATE_STATE_WORDS, type CertificateState } from "~/domain/certificates/certificate";

function Shape({ state }: { state: CertificateState }) {
  const common = { width: 14, height: 14, viewBox: "0 0 16 16", "aria-hidden": true as const, className: "shrink-0" };
  if (state === "valid")
    return (
      <svg {...common}>
        <circle cx="8" cy="8" r="6.5" fill="#0F5C57" />
      </svg>
    );
  if (state === "expired")
    return (
      <svg {...common}>
        <circle cx="8" cy="8" r="6" fill="none" stroke="#B8432A" strokeWidth="2" />
        <rect x="3.5" y="7" width="9" height="2" fill="#B8432A" />
      </svg>
    );
  return (
    <svg {...common}>
      <circle cx="8" cy="8" r="6" fill="none" stroke="#B8432A" strokeWidth="1.6" />
      <path d="M5 5 11 11M11 5 5 11" stroke="#B8432A" strokeWidth="1.6" />
    </svg>
  );
}

export function CertificateStateMark({ state }: { state: CertificateState }) {
  return (
    <span className="inline-flex items-center gap-1.5 whitespace-nowrap" data-state={state}>
      <Shape state={state} />
      <span className={state === "valid" ? undefined : "font-semibold"}>{CERTIFICATE_STATE_WORDS[state]}</span>
    </span>
  );
}
