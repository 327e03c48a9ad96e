import type { ReactNode } from 'react';
import { ARISCAT_RISK_CLASS_LABELS } from '../../../../shared/clinical/scores.js';
import { DICTIONARY_SECTION_LABELS } from '../../../../shared/registry/meta.js';
import type { LiveValues } from '../live-values.js';

const COMPONENT_LABELS: Record<string, string> = {
  age: 'Age', preopSpO2: 'Pre-operative SpO2', respiratoryInfectionLastMonth: 'Respiratory infection in the last month', preopHemoglobin: 'Anaemia (Hb ≤ 10 g/dL)',
  incision: 'Incision', durationMinutes: 'Duration of surgery', emergency: 'Emergency procedure',
};
const CLASS_CLS = { low: 'border-ok text-ok', intermediate: 'border-ochre text-ochre', high: 'border-danger text-danger' } as const;

function Row({ label, value }: { label: string; value: string }) {
  return <div className="flex justify-between gap-2 border-b border-line/60 py-1"><dt className="text-muted">{label}</dt><dd className="tabular text-right font-semibold">{value}</dd></div>;
}

/** Values computed as the abstractor types (same functions as the server). */
export function ComputedPanel({ live, sectionIds, actions }: { live: LiveValues; sectionIds: Record<string, string>; actions?: ReactNode }) {
  const a = live.ariscat;
  const c = live.completeness;
  return (
    <aside aria-labelledby="computed-title" className="rounded border border-line bg-panel p-3 text-sm">
      {actions && <div className="no-print mb-3 flex flex-wrap items-center gap-2 border-b border-line pb-3">{actions}</div>}
      <h2 id="computed-title" className="mb-2 text-base font-semibold">Computed as you type</h2>
      <section aria-label="ARISCAT score" className="mb-3" aria-live="polite">
        <h3 className="font-semibold">ARISCAT pre-operative risk</h3>
        {a.result ? (
          <>
            <p className="mt-1 flex items-center gap-2">
              <span className="text-2xl font-bold tabular">{a.result.points}</span><span>points</span>
              <span className={`rounded-full border px-2 py-0.5 text-xs font-semibold ${CLASS_CLS[a.result.riskClass]}`}>{ARISCAT_RISK_CLASS_LABELS[a.result.riskClass]}</span>
            </p>
            <table className="mt-1 w-full text-xs">
              <caption className="sr-only">Points per ARISCAT factor</caption>
              <tbody>{Object.entries(a.result.components).map(([k, v]) => <tr key={k} className="border-b border-line/60"><th scope="row" className="py-0.5 text-left font-normal text-muted">{COMPONENT_LABELS[k] ?? k}</th><td className="text-right tabular">{v}</td></tr>)}</tbody>
            </table>
          </>
        ) : a.error ? <p className="text-danger">{a.error}</p> : <p className="text-muted">Not scored yet: enter {a.missing.join(', ')}. A missing input is never scored as zero.</p>}
        <p className="mt-1 text-xs text-muted">Canet J et al., Anesthesiology 2010;113:1338-50.</p>
        {live.asaWarnings.map((w) => <p key={w} className="mt-1 rounded bg-warn-soft px-2 py-1 text-xs">{w}</p>)}
      </section>
      <dl className="mb-3">
        <Row label="BMI" value={live.bmi == null ? '—' : `${live.bmi.toFixed(1)} kg/m²`} />
        <Row label="Length of stay" value={live.lengthOfStayDays == null ? '—' : `${live.lengthOfStayDays} days`} />
        <Row label="Post-operative stay" value={live.postoperativeStayDays == null ? '—' : `${live.postoperativeStayDays} days`} />
        <Row label="Days to first therapy" value={live.daysToFirstTherapy == null ? '—' : `day ${live.daysToFirstTherapy}`} />
        <Row label="30-day follow-up ends" value={live.followUpWindowEnd == null ? '—' : `${live.followUpWindowEnd}${live.followUpClosed ? ' (closed)' : ''}`} />
        {live.adherence.map((x, i) => <Row key={i} label={`Adherence, episode ${i + 1}`} value={x == null ? '—' : `${Math.round(x * 100)}%`} />)}
      </dl>
      <section aria-label="Required data">
        <h3 className="font-semibold">{c.complete ? 'All required data entered' : `${c.missing.length} required item${c.missing.length === 1 ? '' : 's'} missing`}</h3>
        <ul className="mt-1">
          {Object.entries(c.sections).map(([s, n]) => (
            <li key={s} className="flex justify-between">
              <a href={`#${sectionIds[s]}`} className="text-accent underline-offset-2 hover:underline">{DICTIONARY_SECTION_LABELS[s as keyof typeof DICTIONARY_SECTION_LABELS]}</a>
              <span className={n ? 'text-ochre' : 'text-ok'}>{n ? `${n} missing` : '✓ complete'}</span>
            </li>
          ))}
        </ul>
        {!c.complete && (
          <details className="mt-1 text-xs">
            <summary className="cursor-pointer text-muted">Which items</summary>
            <ul className="list-disc pl-4">{c.missing.map((m) => <li key={m.field}>{m.message}</li>)}</ul>
          </details>
        )}
        <p className="mt-1 text-xs text-muted">A draft can be saved with items missing; marking it complete needs them all.</p>
      </section>
    </aside>
  );
}
