/**
 * The case form: patient, operation, therapy, outcomes and follow-up, validated with the shared
 * zod schemas (react-hook-form + zodResolver), computed values live beside it, an unsaved-change
 * warning, Ctrl+S to save, and 409 conflicts resolved field by field without losing input.
 */
import { useEffect, useMemo, useState, type ReactNode } from 'react';
import { useForm, useWatch, type Path } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Link, useBlocker, useNavigate, useParams } from 'react-router-dom';
import type { Sex } from '../../../shared/clinical/codes.js';
import { CASE_FIELDS, type CaseFieldName } from '../../../shared/registry/case.js';
import { EDITABLE_STATUSES } from '../../../shared/registry/status.js';
import type { Case } from '../../../shared/registry/record.js';
import { FREE_TEXT_REMINDER } from '../../../shared/registry/text.js';
import { Button, ErrorState, Loading, Notice, PageHeader } from '../../components/ui.js';
import { StatusBadge } from '../../components/status-badge.js';
import { ApiError, getErrorMessage } from '../../lib/api-client.js';
import { paths } from '../../lib/paths.js';
import { useSession } from '../../lib/session.js';
import { useCase } from './api/get-case.js';
import { useSites } from './api/get-sites.js';
import { useCaseWritten } from './api/write-case.js';
import { ComputedPanel } from './components/computed-panel.js';
import { ConflictPanel } from './components/conflict-panel.js';
import { SelectField, TextField } from './components/fields.js';
import { OutcomesSection } from './components/outcomes-section.js';
import { SchemaField } from './components/schema-field.js';
import { TherapySection, type Removal } from './components/therapy-section.js';
import { caseToForm, CaseFormSchema, emptyForm, findConflicts, mergeAfterConflict, type CaseFormOutput, type CaseFormValues, type FieldConflict } from './form-model.js';
import { browserToday, liveValues } from './live-values.js';
import { conflictCase, saveCase, SaveError, type SaveBase } from './save-case.js';
import { INCISION_SITE_TO_ARISCAT, ARISCAT_INCISION_LABELS } from '../../../shared/clinical/codes.js';

const SECTION_IDS = { patient: 'sec-patient', operation: 'sec-operation', therapy: 'sec-therapy', outcomes: 'sec-outcomes', 'follow-up': 'sec-follow-up' };
const SECTION_TITLES = { patient: 'Patient', operation: 'Operation', therapy: 'Lung-expansion therapy', outcomes: 'Outcomes', 'follow-up': 'Follow-up' };

const normal = (v: unknown) => JSON.stringify(v, (_k, x) => (x === undefined ? null : x));

function Section({ id, title, children, missing }: { id: string; title: string; children: ReactNode; missing?: number }) {
  return (
    <section id={id} aria-labelledby={`${id}-h`} className="@container scroll-mt-4 rounded border border-line bg-panel p-4">
      <h2 id={`${id}-h`} className="mb-3 flex flex-wrap items-baseline justify-between gap-2 text-lg font-semibold">
        {title}
        {missing != null && <span className={`text-xs font-normal ${missing ? 'text-ochre' : 'text-ok'}`}>{missing ? `${missing} required item${missing === 1 ? '' : 's'} missing` : '✓ required items entered'}</span>}
      </h2>
      {children}
    </section>
  );
}

function UnsavedDialog({ onStay, onLeave }: { onStay: () => void; onLeave: () => void }) {
  return (
    <div role="alertdialog" aria-modal="true" aria-labelledby="unsaved-title" className="fixed inset-0 z-50 flex items-center justify-center bg-ink/40 p-4" onKeyDown={(e) => e.key === 'Escape' && onStay()}>
      <div className="max-w-md rounded border border-line bg-panel p-4 shadow-lg">
        <h2 id="unsaved-title" className="text-base font-semibold">Leave without saving?</h2>
        <p className="mt-1 text-sm">Your changes to this case are not saved yet. If you leave now they are lost.</p>
        <div className="mt-3 flex gap-2">
          <Button autoFocus type="button" onClick={onStay}>Stay and keep editing</Button>
          <Button type="button" variant="danger" onClick={onLeave}>Leave and discard</Button>
        </div>
      </div>
    </div>
  );
}

function CaseForm({ existing }: { existing: Case | null }) {
  const session = useSession();
  const user = session.data!.user;
  const sites = useSites();
  const navigate = useNavigate();
  const written = useCaseWritten();
  const mySites = useMemo(() => (sites.data?.items ?? []).filter((s) => s.active && (user.roles.includes('admin') || user.siteIds.includes(s.id))), [sites.data, user]);
  const [base, setBase] = useState<SaveBase | null>(existing ? { case: existing, form: caseToForm(existing) } : null);
  const initial = useMemo(() => base?.form ?? emptyForm(mySites.length === 1 ? mySites[0].id : ''), []);
  const form = useForm<CaseFormValues, unknown, CaseFormOutput>({ resolver: zodResolver(CaseFormSchema), defaultValues: initial, mode: 'onTouched' });
  const { control, handleSubmit, setValue, setError, reset, getValues } = form;
  const values = useWatch({ control }) as CaseFormValues;
  const [removals, setRemovals] = useState<Removal[]>([]);
  const [saving, setSaving] = useState(false);
  const [saveError, setSaveError] = useState<unknown>(null);
  const [duplicate, setDuplicate] = useState<string | null>(null);
  const [conflict, setConflict] = useState<{ theirs: Case; conflicts: FieldConflict[] } | null>(null);
  const [savedOnce, setSavedOnce] = useState(false);
  const baseline = base?.form ?? initial;
  const dirty = removals.length > 0 || normal({ ...values, amendmentReason: null }) !== normal({ ...baseline, amendmentReason: null });
  const live = liveValues(values, browserToday());
  const status = base?.case.status;
  const locked = status === 'locked';
  const readOnly = !!status && !EDITABLE_STATUSES.includes(status) && !locked;

  // Unsaved-change warning: in-app navigation (router blocker) and closing or reloading the tab.
  const blocker = useBlocker(({ currentLocation, nextLocation }) => dirty && !saving && currentLocation.pathname !== nextLocation.pathname);
  useEffect(() => {
    if (!dirty) return;
    const h = (e: BeforeUnloadEvent) => { e.preventDefault(); e.returnValue = ''; };
    window.addEventListener('beforeunload', h);
    return () => window.removeEventListener('beforeunload', h);
  }, [dirty]);

  const submit = (opts: { acknowledgeDuplicate?: boolean } = {}) => handleSubmit(async (v) => {
    setSaving(true); setSaveError(null); setDuplicate(null);
    try {
      const { saved } = await saveCase(v, base, removals, opts);
      written(saved);
      setRemovals([]);
      const next = caseToForm(saved);
      setBase({ case: saved, form: next });
      reset(next);
      setSavedOnce(true);
      // Saved: the blocker sees a clean form, so navigating is allowed.
      setTimeout(() => navigate(paths.cases.detail(saved.id), { state: { saved: true } }), 0);
    } catch (err) {
      const e = err instanceof SaveError ? err : new SaveError(err, null, 'the case', '', { therapy: {}, outcomes: {} });
      // Records created before the refusal keep their new ids, so a second save does not repeat them.
      if (e.saved) {
        for (const [i, id] of Object.entries(e.assigned.therapy)) setValue(`therapy.${Number(i)}.recordId` as Path<CaseFormValues>, id as never);
        for (const [i, id] of Object.entries(e.assigned.outcomes)) setValue(`outcomes.${Number(i)}.recordId` as Path<CaseFormValues>, id as never);
        const savedForm = caseToForm(e.saved);
        setBase({ case: e.saved, form: savedForm });
      }
      const theirs = conflictCase(e.cause);
      if (theirs) {
        const mine = getValues();
        setConflict({ theirs, conflicts: findConflicts(mine, (e.saved ? caseToForm(e.saved) : base?.form) ?? mine, caseToForm(theirs)) });
      } else if (e.cause instanceof ApiError && e.cause.code === 'possible_duplicate') {
        setDuplicate(getErrorMessage(e.cause));
      } else {
        if (e.cause instanceof ApiError) for (const f of e.cause.fields) setError(`${e.pathPrefix}${f.path}` as Path<CaseFormValues>, { type: 'server', message: f.message });
        setSaveError(e);
      }
    } finally {
      setSaving(false);
    }
  });

  useEffect(() => {
    const h = (ev: KeyboardEvent) => {
      if ((ev.ctrlKey || ev.metaKey) && ev.key.toLowerCase() === 's') { ev.preventDefault(); void submit()(); }
    };
    window.addEventListener('keydown', h);
    return () => window.removeEventListener('keydown', h);
  });

  const applyConflict = (takeTheirs: Set<string>) => {
    if (!conflict) return;
    const theirsForm = caseToForm(conflict.theirs);
    const merged = mergeAfterConflict(getValues(), base?.form ?? theirsForm, theirsForm, takeTheirs);
    setBase({ case: conflict.theirs, form: theirsForm });
    reset(merged, { keepDefaultValues: true });
    setConflict(null);
  };

  const f = (k: CaseFieldName, extra: { hint?: ReactNode; className?: string } = {}) => <SchemaField key={k} control={control} name={k as Path<CaseFormValues>} schema={CASE_FIELDS[k]} hint={extra.hint} className={extra.className} />;
  const site = (sites.data?.items ?? []).find((s) => s.id === values.siteId);
  const incisionHint = values.incisionSite ? `ARISCAT class: ${ARISCAT_INCISION_LABELS[INCISION_SITE_TO_ARISCAT[values.incisionSite]]}.` : 'Each incision site maps to one ARISCAT class.';
  const sec = live.completeness.sections;
  // Counted after a save was tried (before that, messages appear field by field as they are left).
  const errorCount = form.formState.submitCount > 0 ? Object.keys(form.formState.errors).length : 0;
  const ctx = { surgeryDate: values.surgeryDate || null, admissionDate: values.admissionDate, age: values.age, copd: values.copd, heartFailure: values.heartFailure };

  if (readOnly) return <Notice tone="warn">This case is {status}: it cannot be edited. {status === 'withdrawn' ? 'An administrator can reinstate it.' : ''}</Notice>;

  return (
    <form noValidate onSubmit={(e) => { e.preventDefault(); void submit()(); }} aria-describedby="form-help">
      <p id="form-help" className="mb-3 text-sm text-muted">
        Save as often as you like: a draft may have items missing. Required items are listed on the right. Keyboard: Tab moves between fields, arrow keys within yes/no choices, Ctrl+S saves.
      </p>
      <nav aria-label="Form sections" className="no-print mb-3 flex flex-wrap gap-2 text-sm">
        {Object.entries(SECTION_IDS).map(([k, id]) => <a key={k} href={`#${id}`} className="rounded border border-line bg-panel px-2 py-1 hover:border-accent">{SECTION_TITLES[k as keyof typeof SECTION_TITLES]}</a>)}
      </nav>
      {conflict && <div className="mb-3"><ConflictPanel conflicts={conflict.conflicts} theirsBy={`The saved case is now version ${conflict.theirs.version} (you started from version ${base?.case.version ?? '?'}).`} onApply={applyConflict} onCancel={() => setConflict(null)} /></div>}
      <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_18rem]">
        <div className="flex min-w-0 flex-col gap-4">
          {locked && (
            <Notice tone="warn">
              <p className="mb-2">This case is locked (its month is closed). A change is an amendment: give the reason; it is kept with every change in the audit trail.</p>
              <TextField control={control} name="amendmentReason" label="Reason for the amendment" multiline hint={FREE_TEXT_REMINDER} />
            </Notice>
          )}
          <Section id={SECTION_IDS.patient} title="Patient" missing={sec.patient}>
            <div className="grid gap-3 @md:grid-cols-2 @xl:grid-cols-3">
              {f('eligible', { hint: site ? <>Inclusion: {(site.inclusionCriteria || 'not stated').replace(/\.$/, '')}. Exclusion: {(site.exclusionCriteria || 'not stated').replace(/\.$/, '')}.</> : 'The site states its inclusion and exclusion criteria.', className: '@md:col-span-2 @xl:col-span-3' })}
              {values.eligible === false && f('exclusionReason', { className: '@md:col-span-2 @xl:col-span-3' })}
              {f('admissionDate')}
              {f('age')}
              {f('sex', { hint: 'Used for the predicted body weight.' })}
              {f('heightCm')}
              {f('weightKg')}
              {f('asaClass')}
              {f('asaEmergency')}
              {f('smokingStatus')}
              {f('functionalStatus')}
              {f('copd')}
              {f('obstructiveSleepApnoea', { hint: 'Home CPAP for sleep apnoea is recorded here, not as therapy.' })}
              {f('heartFailure')}
              {f('preopSpO2', { hint: 'On room air, before surgery.' })}
              {f('preopHaemoglobin')}
              {f('respiratoryInfectionLastMonth')}
            </div>
          </Section>
          <Section id={SECTION_IDS.operation} title="Operation" missing={sec.operation}>
            <div className="grid gap-3 @md:grid-cols-2 @xl:grid-cols-3">
              {existing ? (
                <p className="text-sm"><span className="font-semibold">Site</span><br />{existing.siteCode}{site ? ` — ${site.name}` : ''}</p>
              ) : (
                <SelectField control={control} name="siteId" label="Site" options={mySites.map((s) => s.id)} labels={Object.fromEntries(mySites.map((s) => [s.id, `${s.code} — ${s.name}`]))} empty="Choose the site" onValue={() => setValue('unitId', null)} />
              )}
              <SelectField control={control} name="unitId" label="Unit after surgery" options={(site?.units ?? []).filter((u) => u.active).map((u) => u.id)} labels={Object.fromEntries((site?.units ?? []).map((u) => [u.id, `${u.code} — ${u.name}`]))} empty={site ? 'Not recorded' : 'Choose the site first'} />
              {f('surgeryDate', { hint: 'Post-operative day 0; the case belongs to this month.' })}
              {f('procedureCategory')}
              {f('incisionSite', { hint: incisionHint })}
              {f('approach')}
              {f('urgency', { hint: 'ARISCAT’s emergency factor comes from urgency alone.' })}
              {f('anaesthesia')}
              {f('durationMinutes', { hint: 'Incision to closure.' })}
              <div className="@md:col-span-2 @xl:col-span-3">
                <TextField control={control} name="localIdentifier" label="Hospital’s own identifier (optional)"
                  hint={<>Only to catch the same case or patient entered twice. The server keeps a keyed hash of it (with the site) and never stores, logs or shows the identifier itself.{existing?.hasLocalIdentifier ? ' A hash is already recorded for this case; typing one replaces it.' : ''}</>} />
              </div>
            </div>
          </Section>
          <Section id={SECTION_IDS.therapy} title="Lung-expansion therapy" missing={sec.therapy}>
            <div className="mb-3">{f('therapyGiven')}</div>
            <TherapySection control={control} setValue={setValue} adherence={live.adherence} heightCm={typeof values.heightCm === 'number' ? values.heightCm : null} sex={(values.sex as Sex) ?? null} onRemoved={(r) => setRemovals((x) => [...x, r])} />
          </Section>
          <Section id={SECTION_IDS.outcomes} title="Outcomes: post-operative pulmonary complications" missing={sec.outcomes}>
            <div className="mb-3">{f('complicationsReviewed')}</div>
            <OutcomesSection control={control} ctx={ctx} onRemoved={(r) => setRemovals((x) => [...x, r])} />
          </Section>
          <Section id={SECTION_IDS['follow-up']} title="Follow-up (30 days)" missing={sec['follow-up']}>
            <div className="grid gap-3 @md:grid-cols-2 @xl:grid-cols-3">
              {f('dischargeDate')}
              {f('icuDays')}
              {f('ventilatorDays')}
              {f('readmitted30d')}
              {values.readmitted30d === true && f('readmissionCause')}
              {f('died30d')}
              {values.died30d === true && f('deathDate')}
              {f('followUpCompletedOn')}
              <div className="@md:col-span-2 @xl:col-span-3">{f('notes')}</div>
            </div>
          </Section>
        </div>
        <div className="order-first lg:order-none">
          <div className="lg:sticky lg:top-4"><ComputedPanel live={live} sectionIds={SECTION_IDS} actions={<>
            <Button type="submit" disabled={saving} aria-describedby="save-state">{saving ? 'Saving…' : existing || base ? 'Save changes' : 'Save case'}</Button>
            <span id="save-state" className={`text-xs ${dirty ? 'text-ochre' : 'text-ok'}`}>{dirty ? 'Unsaved changes' : savedOnce ? 'Saved' : ''}</span>
          </>} /></div>
        </div>
      </div>
      <div className="mt-4 flex flex-wrap items-center gap-3 border-t border-line py-3 no-print">
        <Button type="submit" disabled={saving}>{saving ? 'Saving…' : existing || base ? 'Save changes' : 'Save case'}</Button>
        {dirty ? <span className="text-sm text-ochre">Unsaved changes</span> : savedOnce ? <span className="text-sm text-ok">Saved</span> : null}
        {errorCount > 0 && <span className="text-sm text-danger" role="alert">{errorCount} field{errorCount === 1 ? '' : 's'} need attention: see the messages in red.</span>}
        {base && <Link to={paths.cases.detail(base.case.id)} className="text-sm text-accent underline">Back to the case</Link>}
      </div>
      {duplicate && (
        <Notice tone="warn">
          <p>{duplicate}</p>
          <Button type="button" variant="secondary" className="mt-2" onClick={() => void submit({ acknowledgeDuplicate: true })()}>It is a second operation: save anyway</Button>
        </Notice>
      )}
      {saveError != null && (
        <div className="mt-2">
          <ErrorState error={(saveError as SaveError).cause ?? saveError} />
          {(saveError as SaveError).saved && <p className="mt-1 text-sm">Saved up to {(saveError as SaveError).where}: the rest is still in the form. Correct it and save again.</p>}
        </div>
      )}
      {blocker.state === 'blocked' && <UnsavedDialog onStay={() => blocker.reset()} onLeave={() => blocker.proceed()} />}
    </form>
  );
}

export function NewCasePage() {
  const sites = useSites();
  return (
    <div>
      <PageHeader title="New case" subtitle="A surgical case of one of your sites, with its therapy and outcomes. Do not enter names, record numbers or other identifiers." />
      {sites.isPending ? <Loading what="sites" /> : sites.error ? <ErrorState error={sites.error} retry={() => sites.refetch()} /> : <CaseForm existing={null} />}
    </div>
  );
}

export function EditCasePage() {
  const { id = '' } = useParams();
  const c = useCase(id);
  const sites = useSites();
  return (
    <div>
      <PageHeader title={c.data ? `Edit case ${c.data.registryNumber}` : 'Edit case'} subtitle={c.data && <span className="inline-flex items-center gap-2"><StatusBadge status={c.data.status} /> version {c.data.version}{c.data.status === 'verified' ? ' · a change sends it back to complete for verification again' : ''}</span>} />
      {c.isPending || sites.isPending ? <Loading what="the case" /> : c.error ? <ErrorState error={c.error} retry={() => c.refetch()} /> : <CaseForm key={c.data!.id} existing={c.data!} />}
    </div>
  );
}
