/** The caution every clinical page, certificate and the bench carries (PRODUCT.md). */
export const CAUTION_TEXT =
  "Tidemark is for education and record-keeping. It does not replace the device's instructions for use, your local policy and protocols, or licensed clinical judgement.";

export function CautionFooter() {
  return (
    <aside aria-label="Caution" className="mt-10 border-t border-rule pt-4 text-sm text-muted">
      <p>
        <strong className="font-semibold text-ink">Caution.</strong> {CAUTION_TEXT}
      </p>
    </aside>
  );
}
