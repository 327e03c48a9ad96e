/**
 * One case: its values by section, computed measures, therapy, outcomes with the definitions
 * stored for each event, the status actions the user may take, and the audit trail.
 */
import { useState, type ReactNode } from 'react';
import { Link, useLocation, useNavigate, useParams } from 'react-router-dom';
import { OBSERVATION_KIND_LABELS, PPC_EVENT_TYPE_LABELS, THERAPY_MODALITY_LABELS, CLAVIEN_DINDO_LABELS } from '../../../shared/clinical/codes.js';
import { ARISCAT_RISK_CLASS_LABELS } from '../../../shared/clinical/scores.js';
import { CASE_FIELDS, CASE_FIELD_NAMES, type CaseFieldName } from '../../../shared/registry/case.js';
import { DICTIONARY_SECTION_LABELS, fieldMeta, type DictionarySection } from '../../../shared/registry/meta.js';
import type { Case } from '../../../shared/registry/record.js';
import { DEFINITION_LABELS } from '../../../shared/registry/outcome.js';
import { EDITABLE_STATUSES, TRANSITIONS, type Transition } from '../../../shared/registry/status.js';
import { ReasonSchema } from '../../../shared/registry/text.js';
import { FREE_TEXT_REMINDER } from '../../../shared/registry/text.js';
import { Button, ErrorState, inputClass, Loading, Notice, PageHeader, Panel } from '../../components/ui.js';
import { StatusBadge } from '../../components/status-badge.js';
import { paths } from '../../lib/paths.js';
import { userHasAccess, useSession } from '../../lib/session.js';
import { useCase } from './api/get-case.js';
import { useCaseAudit } from './api/get-case-audit.js';
import { useSites } from './api/get-sites.js';
import { useChangeStatus } from './api/write-case.js';
import { DefinitionsView } from './components/definitions-view.js';
import { showValue } from './form-model.js';
import { storedViews } from './outcome-evaluation.js';

/** Audit entries name case fields, `therapy.<id>`, `outcomes.<id>`, status and the like. */
function auditFieldLabel(field: string | null): string {
  if (!field) return '—';
  if (Object.hasOwn(CASE_FIELDS, field)) return fieldMeta(CASE_FIELDS[field as CaseFieldName])?.label ?? field;
  if (field.startsWith('therapy.')) return 'therapy episode';
  if (field.startsWith('outcomes.')) return 'outcome event';
  return field === 'ariscat' ? 'ARISCAT' : field;
}

/** A stored audit value in words: codes by their labels, yes/no, long lists folded. */
function AuditValue({ field, value }: { field: string | null; value: string | null }) {
  if (value == null) return <>—</>;
  const meta = field && Object.hasOwn(CASE_FIELDS, field) ? fieldMeta(CASE_FIELDS[field as CaseFieldName]) : undefined;
  const words = value === 'true' ? 'Yes' : value === 'false' ? 'No' : meta?.valueLabels?.[value] ?? value;
  if (words.length <= 120) return <>{words}</>;
  return <details><summary className="cursor-pointer">{words.slice(0, 60)}…</summary><span className="font-mono text-xs">{words}</span></details>;
}

const SECTIONS: DictionarySection[] = ['patient', 'operation', 'therapy', 'outcomes', 'follow-up', 'registry'];

function display(k: CaseFieldName, v: unknown): string {
  const meta = fieldMeta(CASE_FIELDS[k]);
  if (v == null) return '—';
  if (meta?.valueLabels && typeof v === 'string') return meta.valueLabels[v] ?? v;
  if (typeof v === 'number' && meta?.unit && !meta.unit.startsWith('date')) return `${v} ${meta.unit}`;
  return showValue(v);
}

function StatusActions({ c }: { c: Case }) {
  const session = useSession();
  const user = session.data!.user;
  const change = useChangeStatus(c.id);
  const navigate = useNavigate();
  const [asking, setAsking] = useState<Transition | null>(null);
  const [reason, setReason] = useState('');
  const [reasonError, setReasonError] = useState<string | null>(null);
  const moves = TRANSITIONS.filter((t) => t.from.includes(c.status) && user.roles.some((r) => t.roles.includes(r)));
  const go = (t: Transition, why?: string) => change.mutate({ to: t.to, version: c.version, reason: why }, { onSuccess: () => { setAsking(null); setReason(''); navigate('.', { replace: true, state: null }); } });
  const disabledWhy = (t: Transition): string | null => {
    if (t.to === 'verified' && !c.canVerify.allowed) return c.canVerify.reason ?? 'you cannot verify this case';
    if (t.needsComplete && !c.completeness.complete) return `${c.completeness.missing.length} required item${c.completeness.missing.length === 1 ? ' is' : 's are'} missing`;
    return null;
  };
  const canEdit = userHasAccess(user, ['admin', 'abstractor']);
  return (
    <div className="flex flex-col gap-2">
      <div className="flex flex-wrap items-start gap-2">
        {canEdit && EDITABLE_STATUSES.includes(c.status) && <Link to={paths.cases.edit(c.id)} className="inline-flex items-center rounded bg-accent px-3 py-1.5 text-sm font-semibold text-white hover:bg-accent-strong">Edit case</Link>}
        {canEdit && c.status === 'locked' && <Link to={paths.cases.edit(c.id)} className="inline-flex items-center rounded border border-line bg-panel px-3 py-1.5 text-sm font-semibold hover:border-accent">Amend (with a reason)</Link>}
        {moves.map((t) => {
          const why = disabledWhy(t);
          return (
            <span key={t.label} className="flex flex-col">
              <Button className="self-start disabled:opacity-60" variant={t.to === 'withdrawn' ? 'danger' : t.to === 'verified' ? 'primary' : 'secondary'} disabled={!!why || change.isPending} aria-describedby={why ? `why-${t.to}` : undefined}
                onClick={() => (t.needsReason ? setAsking(t) : go(t))}>{t.label}</Button>
              {why && <span id={`why-${t.to}`} className="mt-0.5 max-w-56 text-xs text-muted">{t.label} is not available: {why}.</span>}
            </span>
          );
        })}
      </div>
      {asking && (
        <form className="rounded border border-line bg-surface p-2" onSubmit={(e) => { e.preventDefault(); const r = ReasonSchema.safeParse(reason); if (!r.success) setReasonError(r.error.issues[0].message); else go(asking, r.data); }}>
          <label htmlFor="status-reason" className="text-sm font-semibold">Reason ({asking.label.toLowerCase()}): kept in the audit trail</label>
          <textarea id="status-reason" rows={2} className={`${inputClass} mt-1 w-full`} value={reason} onChange={(e) => setReason(e.target.value)} aria-invalid={reasonError ? true : undefined} aria-describedby="status-reason-hint" />
          <p id="status-reason-hint" className={`text-xs ${reasonError ? 'text-danger' : 'text-muted'}`} role={reasonError ? 'alert' : undefined}>{reasonError ?? FREE_TEXT_REMINDER}</p>
          <div className="mt-2 flex gap-2"><Button type="submit" variant={asking.to === 'withdrawn' ? 'danger' : 'primary'}>{asking.label}</Button><Button type="button" variant="secondary" onClick={() => setAsking(null)}>Cancel</Button></div>
        </form>
      )}
      {change.error && <ErrorState error={change.error} />}
    </div>
  );
}

function Facts({ c }: { c: Case }) {
  const d = c.derived;
  const row = (label: string, value: ReactNode) => <div className="flex justify-between gap-3 border-b border-line/60 py-1 text-sm"><dt className="text-muted">{label}</dt><dd className="text-right font-semibold tabular">{value}</dd></div>;
  return (
    <Panel title="Computed">
      <dl>
        {row('ARISCAT', c.ariscat ? <>{c.ariscat.points} points · {ARISCAT_RISK_CLASS_LABELS[c.ariscat.riskClass]}</> : 'not scored (an input is missing)')}
        {row('BMI', d.bmi == null ? '—' : `${d.bmi} kg/m²`)}
        {row('Length of stay', d.lengthOfStayDays == null ? '—' : `${d.lengthOfStayDays} days`)}
        {row('Post-operative stay', d.postoperativeStayDays == null ? '—' : `${d.postoperativeStayDays} days`)}
        {row('Days to first therapy', d.daysToFirstTherapy == null ? '—' : `day ${d.daysToFirstTherapy}`)}
        {row('Surveillance month', d.surveillanceMonth)}
        {row('30-day follow-up ends', `${d.followUpWindowEnd}${d.followUpClosed ? ' (closed)' : ''}`)}
        {row('Any PPC', d.anyPpc ? 'Yes' : 'No')}
        {row('Pneumonia (CDC/NHSN PNU1)', d.pneumoniaNhsn ? 'Yes' : 'No')}
        {row('Counts in analyses', d.countsInAnalysis ? 'Yes' : `No (${c.status})`)}
      </dl>
    </Panel>
  );
}

function AuditTrail({ id }: { id: string }) {
  const [reads, setReads] = useState(false);
  const audit = useCaseAudit(id, reads);
  const items = audit.data?.items ?? [];
  return (
    <Panel title="Audit trail">
      <label className="mb-2 flex items-center gap-2 text-sm"><input type="checkbox" checked={reads} onChange={(e) => setReads(e.target.checked)} /> Include who opened the case</label>
      {audit.isPending && <Loading what="the audit trail" />}
      {audit.error && <ErrorState error={audit.error} retry={() => audit.refetch()} />}
      {audit.data && (
        <div className="overflow-x-auto" tabIndex={0} role="region" aria-label="Audit trail table (scrolls sideways)">
          <table className="w-full min-w-[46rem] text-left text-sm">
            <caption className="sr-only">Every change to this case: who, when, field, old value, new value</caption>
            <thead className="border-b border-line text-muted"><tr><th scope="col" className="py-1 pr-3">When</th><th scope="col" className="pr-3">Who</th><th scope="col" className="pr-3">What</th><th scope="col" className="pr-3">Field</th><th scope="col" className="pr-3">Old</th><th scope="col" className="pr-3">New</th><th scope="col">Reason</th></tr></thead>
            <tbody>
              {items.map((e) => (
                <tr key={e.id} className="border-b border-line/60 align-top">
                  <td className="whitespace-nowrap py-1 pr-3 tabular">{new Date(e.at).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' })}</td>
                  <td className="pr-3">{e.actorEmail ?? 'system'}</td>
                  <td className="whitespace-nowrap pr-3">{e.action.replace(/-/g, ' ')}</td>
                  <td className="pr-3">{auditFieldLabel(e.field)}</td>
                  <td className="max-w-48 break-words pr-3"><AuditValue field={e.field} value={e.oldValue} /></td>
                  <td className="max-w-48 break-words pr-3"><AuditValue field={e.field} value={e.newValue} /></td>
                  <td className="max-w-48 break-words">{e.reason ?? ''}</td>
                </tr>
              ))}
            </tbody>
          </table>
          {items.length === 0 && <p className="text-sm text-muted">No entries.</p>}
        </div>
      )}
    </Panel>
  );
}

export function CaseDetailPage() {
  const { id = '' } = useParams();
  const location = useLocation();
  const q = useCase(id);
  const sites = useSites();
  if (q.isPending) return <div><PageHeader title="Case" /><Loading what="the case" /></div>;
  if (q.error) return <div><PageHeader title="Case" /><ErrorState error={q.error} retry={() => q.refetch()} /></div>;
  const c = q.data;
  const units = new Map((sites.data?.items ?? []).flatMap((s) => s.units.map((u) => [u.id, `${u.code} — ${u.name}`] as const)));
  const shown = (k: CaseFieldName) => (k === 'unitId' && c.unitId ? units.get(c.unitId) ?? 'a unit of the site' : display(k, (c as Record<string, unknown>)[k]));
  const bySection = (s: DictionarySection) => CASE_FIELD_NAMES.filter((k) => fieldMeta(CASE_FIELDS[k])?.section === s);
  return (
    <div>
      <PageHeader
        title={`Case ${c.registryNumber}`}
        subtitle={<span className="inline-flex flex-wrap items-center gap-2"><StatusBadge status={c.status} /> {c.siteCode} · surgery {c.surgeryDate} · version {c.version}{c.verifiedBy ? ` · verified by ${c.verifiedBy}` : ''}</span>}
        actions={<Link to={paths.cases.list} className="text-sm text-accent underline">All cases</Link>}
      />
      <div className="flex flex-col gap-4">
        {(location.state as { saved?: boolean } | null)?.saved && <Notice tone="ok">Saved. The case is version {c.version}.</Notice>}
        {c.withdrawnReason && <Notice tone="danger">Withdrawn: {c.withdrawnReason}</Notice>}
        {c.possibleDuplicate && <Notice tone="warn">Possible duplicate: the same patient has a case on the same surgery date ({c.otherCasesOfPatient.join(', ')}).</Notice>}
        {!c.possibleDuplicate && c.otherCasesOfPatient.length > 0 && <Notice tone="info">The same patient has other cases at this site: {c.otherCasesOfPatient.join(', ')}.</Notice>}
        <Panel title="Status">
          <StatusActions c={c} />
          {!c.completeness.complete && (
            <details className="mt-2 text-sm"><summary className="cursor-pointer text-ochre">{c.completeness.missing.length} required item{c.completeness.missing.length === 1 ? '' : 's'} missing</summary>
              <ul className="list-disc pl-5">{c.completeness.missing.map((m) => <li key={m.field}>{m.message}</li>)}</ul>
            </details>
          )}
        </Panel>
        {c.warnings.length > 0 && (
          <Notice tone="warn"><p className="font-semibold">Stored with warnings</p><ul className="list-disc pl-5">{c.warnings.map((w) => <li key={w.path + w.code}>{w.message}</li>)}</ul></Notice>
        )}
        <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_20rem]">
          <div className="flex min-w-0 flex-col gap-4">
            {SECTIONS.map((s) => {
              const names = bySection(s);
              return (
                <Panel key={s} title={DICTIONARY_SECTION_LABELS[s]}>
                  {names.length > 0 && (
                    <dl className="grid gap-x-6 sm:grid-cols-2">
                      {names.map((k) => <div key={k} className="flex justify-between gap-3 border-b border-line/60 py-1 text-sm"><dt className="text-muted">{fieldMeta(CASE_FIELDS[k])?.label}</dt><dd className="text-right">{shown(k)}</dd></div>)}
                    </dl>
                  )}
                  {s === 'therapy' && (
                    c.therapy.length === 0 ? <p className="mt-2 text-sm text-muted">No episodes.</p> : (
                      <div className="mt-2 overflow-x-auto" tabIndex={0} role="region" aria-label="Therapy episodes table">
                        <table className="w-full text-left text-sm">
                          <caption className="sr-only">Therapy episodes</caption>
                          <thead className="border-b border-line text-muted"><tr><th scope="col" className="py-1 pr-3">Modality</th><th scope="col" className="pr-3 text-right">Start day</th><th scope="col" className="pr-3 text-right">Sessions</th><th scope="col" className="pr-3 text-right">Adherence</th><th scope="col">Settings and warnings</th></tr></thead>
                          <tbody>{c.therapy.map((e) => (
                            <tr key={e.id} className="border-b border-line/60 align-top">
                              <td className="py-1 pr-3">{THERAPY_MODALITY_LABELS[e.modality]}</td>
                              <td className="pr-3 text-right tabular">{e.startPostoperativeDay ?? '—'}</td>
                              <td className="pr-3 text-right tabular">{e.sessionsDelivered ?? '—'} / {e.sessionsPrescribed ?? '—'}</td>
                              <td className="pr-3 text-right tabular">{e.adherence == null ? '—' : `${Math.round(e.adherence * 100)}%`}</td>
                              <td className="text-xs">
                                {[e.flowLpm != null && `flow ${e.flowLpm} L/min`, e.expiratoryPressureCmH2O != null && `pressure ${e.expiratoryPressureCmH2O} cm H2O`, e.volumeTargetMl != null && `target ${e.volumeTargetMl} mL`, e.inspiratoryCapacityMl != null && `IC ${e.inspiratoryCapacityMl} mL`, e.sessionMinutes != null && `${e.sessionMinutes} min a session`].filter(Boolean).join(' · ') || '—'}
                                {e.warnings.map((w) => <p key={w.path + w.message} className="mt-1 rounded bg-warn-soft px-1">{w.message}</p>)}
                              </td>
                            </tr>
                          ))}</tbody>
                        </table>
                      </div>
                    )
                  )}
                  {s === 'outcomes' && (
                    c.outcomes.length === 0 ? <p className="mt-2 text-sm text-muted">No complications recorded.</p> : (
                      <ol className="mt-2 flex flex-col gap-3">
                        {c.outcomes.map((e) => (
                          <li key={e.id} className="rounded border border-line p-2">
                            <p className="text-sm font-semibold">{PPC_EVENT_TYPE_LABELS[e.type]} · onset day {e.onsetPostoperativeDay} · Clavien–Dindo {e.clavienDindo ? CLAVIEN_DINDO_LABELS[e.clavienDindo] : 'not graded'}</p>
                            <p className="text-xs text-muted">Judged under {DEFINITION_LABELS[e.definition] ?? e.definition}, version {e.definitionVersion}. Evidence: {(e.observations as { kind: keyof typeof OBSERVATION_KIND_LABELS }[]).map((o) => OBSERVATION_KIND_LABELS[o.kind]).join(', ') || 'none'}.</p>
                            <div className="mt-1"><DefinitionsView views={storedViews(e.type, e.evaluations)} invalid={0} title="Definitions stored with the event" /></div>
                          </li>
                        ))}
                      </ol>
                    )
                  )}
                </Panel>
              );
            })}
          </div>
          <div className="order-first flex flex-col gap-4 lg:order-none"><Facts c={c} /></div>
        </div>
        <AuditTrail id={c.id} />
      </div>
    </div>
  );
}
