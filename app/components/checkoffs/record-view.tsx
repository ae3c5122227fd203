import { CAUTION_TEXT } from "~/components/caution";
import { CalendarDate } from "~/components/calendar-date";
import { methodLabel } from "~/domain/checkoffs/methods";
import { OUTCOME_WORDS, RESULT_WORDS, type Mark, type Outcome, type Step } from "~/domain/checkoffs/record";
import { checkoffStatusWord, type CheckoffStatus } from "./checkoff-status";
import { SignatureBlock, type SignatureView } from "./signature-block";

export type RecordViewData = {
  orgName: string;
  checkoff: { id: string; status: CheckoffStatus; outcome: Outcome | null; practicePlan: string | null; practiceBy: string | null; contentHash: string | null };
  person: { name: string; credentialLetters: string | null };
  preceptor: { name: string } | null;
  checklist: { title: string; skill: string; version: number; method: string; references: string; steps: Step[] };
  marks: Mark[];
  signatures: SignatureView[];
  addenda: { id: string; text: string; signature: SignatureView | null }[];
  evidence: { id: string; name: string }[];
  holds: Record<string, boolean>;
};

/** The whole record on one page for paper: every step, comment, signature, addendum and the caution. */
export function RecordView({ d }: { d: RecordViewData }) {
  const marks = new Map(d.marks.map((m) => [m.stepIndex, m]));
  return (
    <article aria-labelledby="record-title" className="flex flex-col gap-5">
      <header>
        <p className="text-muted">{d.orgName} · Check-off record</p>
        <h1 id="record-title" className="text-3xl font-semibold">
          {d.checklist.title}
        </h1>
        <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
          <dt className="text-muted">Therapist</dt>
          <dd>{d.person.credentialLetters ? `${d.person.name}, ${d.person.credentialLetters}` : d.person.name}</dd>
          <dt className="text-muted">Preceptor</dt>
          <dd>{d.preceptor?.name ?? "—"}</dd>
          <dt className="text-muted">Skill</dt>
          <dd>{d.checklist.skill}</dd>
          <dt className="text-muted">Method</dt>
          <dd>
            {methodLabel(d.checklist.method)} · checklist version {d.checklist.version}
          </dd>
          <dt className="text-muted">Status</dt>
          <dd>{checkoffStatusWord(d.checkoff.status)}</dd>
          <dt className="text-muted">Outcome</dt>
          <dd data-testid="record-outcome">{d.checkoff.outcome ? OUTCOME_WORDS[d.checkoff.outcome] : "Not decided"}</dd>
          {d.checkoff.outcome === "needs-practice" ? (
            <>
              <dt className="text-muted">Practice plan</dt>
              <dd>
                {d.checkoff.practicePlan} — by {d.checkoff.practiceBy ? <CalendarDate value={d.checkoff.practiceBy} /> : "—"}
              </dd>
            </>
          ) : null}
          {d.checkoff.contentHash ? (
            <>
              <dt className="text-muted">Content hash</dt>
              <dd className="font-mono text-sm break-all">{d.checkoff.contentHash}</dd>
            </>
          ) : null}
        </dl>
      </header>
      <table className="w-full border-collapse text-left">
        <caption className="sr-only">Steps and results</caption>
        <thead>
          <tr className="border-b border-rule">
            <th scope="col" className="py-1 pr-2">
              #
            </th>
            <th scope="col" className="py-1 pr-2">
              Step
            </th>
            <th scope="col" className="py-1 pr-2">
              Result
            </th>
            <th scope="col" className="py-1">
              Comment
            </th>
          </tr>
        </thead>
        <tbody>
          {d.checklist.steps.map((s, i) => (
            <tr key={i} className="border-b border-rule align-top break-inside-avoid">
              <td className="py-1 pr-2 tabular-nums">{i + 1}</td>
              <td className="py-1 pr-2">
                {s.text}
                {s.critical ? <strong className="font-semibold"> (critical)</strong> : null}
              </td>
              <td className="py-1 pr-2 whitespace-nowrap">{marks.get(i) ? RESULT_WORDS[marks.get(i)!.result] : "Not marked"}</td>
              <td className="py-1">{marks.get(i)?.comment ?? ""}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <section aria-labelledby="record-signatures" className="flex flex-col gap-2 break-inside-avoid">
        <h2 id="record-signatures" className="text-xl font-semibold">
          Signatures
        </h2>
        {d.signatures.length === 0 ? <p>Not signed.</p> : d.signatures.map((s) => <SignatureBlock key={s.id} signature={s} holds={d.holds[s.id]} />)}
      </section>
      <section aria-labelledby="record-addenda" className="flex flex-col gap-2">
        <h2 id="record-addenda" className="text-xl font-semibold">
          Addenda
        </h2>
        {d.addenda.length === 0 ? <p>None.</p> : null}
        {d.addenda.map((a) => (
          <div key={a.id} className="flex flex-col gap-2 border-l-4 border-sea pl-3 break-inside-avoid">
            <p className="whitespace-pre-wrap">{a.text}</p>
            {a.signature ? <SignatureBlock signature={a.signature} holds={d.holds[a.signature.id]} /> : null}
          </div>
        ))}
      </section>
      {d.evidence.length > 0 ? (
        <section aria-labelledby="record-evidence">
          <h2 id="record-evidence" className="text-xl font-semibold">
            Evidence attached
          </h2>
          <ul className="list-disc pl-6">
            {d.evidence.map((e) => (
              <li key={e.id}>{e.name}</li>
            ))}
          </ul>
        </section>
      ) : null}
      <section aria-labelledby="record-references">
        <h2 id="record-references" className="text-xl font-semibold">
          References
        </h2>
        <p>{d.checklist.references}</p>
      </section>
      <aside aria-label="Caution" className="border-t border-rule pt-3 text-sm">
        <strong className="font-semibold">Caution.</strong> {CAUTION_TEXT}
      </aside>
    </article>
  );
}
