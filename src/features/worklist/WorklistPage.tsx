/**
 * The abstractor's to-do list over the cases of their sites: missing required data, 30-day
 * follow-up windows about to close or closed without follow-up, and cases waiting for a
 * second person's verification (only those the user may verify).
 */
import { useState } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import type { Worklist, WorklistItem } from '../../../shared/registry/worklist.js';
import { CASE_FIELDS, type CaseFieldName } from '../../../shared/registry/case.js';
import { fieldMeta } from '../../../shared/registry/meta.js';
import { Button, EmptyState, ErrorState, inputClass, Loading, PageHeader, Panel } from '../../components/ui.js';
import { StatusBadge } from '../../components/status-badge.js';
import { paths } from '../../lib/paths.js';
import { useSession } from '../../lib/session.js';
import { useSites } from './api/get-sites.js';
import { useWorklist } from './api/get-worklist.js';

const fieldLabel = (path: string) => (Object.hasOwn(CASE_FIELDS, path) ? fieldMeta(CASE_FIELDS[path as CaseFieldName])?.label ?? path : path.startsWith('therapy') ? 'a therapy episode item' : path.startsWith('outcomes') ? 'an outcome event item' : path);

type BucketKey = Exclude<keyof Worklist, 'today'>;
const BUCKETS: { key: BucketKey; title: string; empty: string; detail: (i: WorklistItem) => string; daysLabel: string }[] = [
  { key: 'missingData', title: 'Missing required data', empty: 'Every draft and complete case has its required data.', daysLabel: '', detail: (i) => `${i.missing.length} missing: ${i.missing.slice(0, 4).map(fieldLabel).join(', ')}${i.missing.length > 4 ? ', …' : ''}` },
  { key: 'followUpDue', title: 'Follow-up window closing soon', empty: 'No 30-day window closes soon without follow-up.', daysLabel: '', detail: (i) => `window ends ${i.followUpWindowEnd}` },
  { key: 'followUpOverdue', title: 'Follow-up window closed without follow-up', empty: 'No closed window is missing its follow-up.', daysLabel: 'Days since it closed', detail: (i) => `window ended ${i.followUpWindowEnd}` },
  { key: 'awaitingVerification', title: 'Waiting for verification by you', empty: 'Nothing waits for your verification.', daysLabel: 'Days waiting', detail: () => 'entered or changed by someone else' },
];

const FIRST = 8;

function Bucket({ title, items: all, total, empty, detail, daysLabel, id }: { id: string; title: string; items: WorklistItem[]; total: number; empty: string; detail: (i: WorklistItem) => string; daysLabel: string }) {
  const [open, setOpen] = useState(false);
  const items = open ? all : all.slice(0, FIRST);
  return (
    <Panel title={<span id={id}>{title} <span className="ml-1 rounded-full bg-accent-soft px-2 text-sm tabular text-accent">{total.toLocaleString('en-GB')}</span></span>}>
      {items.length === 0 ? <EmptyState title="Nothing here">{empty}</EmptyState> : (
        <div className="overflow-x-auto" tabIndex={0} role="region" aria-labelledby={id}>
          <table className="w-full text-left text-sm" aria-labelledby={id}>
            <thead className="border-b border-line text-muted"><tr><th scope="col" className="py-1 pr-3">Case</th><th scope="col" className="pr-3">Site</th><th scope="col" className="pr-3">Status</th><th scope="col" className="pr-3">Surgery</th><th scope="col" className="pr-3">What is needed</th>{daysLabel && <th scope="col" className="text-right">{daysLabel}</th>}</tr></thead>
            <tbody>
              {items.map((i) => (
                <tr key={i.id} className="border-b border-line/60 align-top">
                  <td className="whitespace-nowrap py-1 pr-3"><Link className="font-semibold text-accent hover:underline" to={paths.cases.detail(i.id)}>{i.registryNumber}</Link></td>
                  <td className="pr-3">{i.siteCode}</td>
                  <td className="pr-3"><StatusBadge status={i.status} /></td>
                  <td className="whitespace-nowrap pr-3 tabular">{i.surgeryDate}</td>
                  <td className="pr-3">{detail(i)}{i.overdue && <span className="ml-2 rounded bg-danger-soft px-1 text-xs font-semibold text-danger">overdue</span>}</td>
                  {daysLabel && <td className="text-right tabular">{i.days ?? '—'}</td>}
                </tr>
              ))}
            </tbody>
          </table>
          <div className="mt-1 flex flex-wrap items-center gap-2 text-xs text-muted">
            {all.length > FIRST && <Button variant="ghost" className="px-0 text-xs" aria-expanded={open} onClick={() => setOpen(!open)}>{open ? `Show the first ${FIRST} only` : `Show all ${all.length} listed`}</Button>}
            {total > all.length && <span>The list holds the {all.length} most pressing of {total.toLocaleString('en-GB')}; filter by site to narrow it.</span>}
          </div>
        </div>
      )}
    </Panel>
  );
}

export function WorklistPage() {
  const [sp, setSp] = useSearchParams();
  const siteId = sp.get('siteId') ?? undefined;
  const due = Number(sp.get('due') ?? 7) || 7;
  const w = useWorklist({ siteId, dueWithinDays: due });
  const sites = useSites();
  const user = useSession().data!.user;
  const mySites = (sites.data?.items ?? []).filter((s) => user.roles.includes('admin') || user.siteIds.includes(s.id));
  const set = (k: string, v: string | undefined) => { const n = new URLSearchParams(sp); if (v) n.set(k, v); else n.delete(k); setSp(n); };
  return (
    <div>
      <PageHeader title="Worklist" subtitle={w.data ? `Cases of your sites that need something, as of ${w.data.today}.` : 'Cases of your sites that need something.'} />
      <div className="no-print mb-4 flex flex-wrap gap-4">
        <label className="flex flex-col gap-1 text-sm font-semibold">Site
          <select className={inputClass} value={siteId ?? ''} onChange={(e) => set('siteId', e.target.value || undefined)}>
            <option value="">All my sites</option>
            {mySites.map((s) => <option key={s.id} value={s.id}>{s.code} — {s.name}</option>)}
          </select>
        </label>
        <label className="flex flex-col gap-1 text-sm font-semibold">Windows closing within
          <select className={inputClass} value={due} onChange={(e) => set('due', e.target.value)}>
            {[3, 7, 14, 30].map((d) => <option key={d} value={d}>{d} days</option>)}
          </select>
        </label>
      </div>
      {w.isPending && <Loading what="the worklist" />}
      {w.error && <ErrorState error={w.error} retry={() => w.refetch()} />}
      {w.data && (
        <div className="flex flex-col gap-4">
          {BUCKETS.map((b) => <Bucket key={b.key} id={`wl-${b.key}`} title={b.title} items={w.data[b.key].items} total={w.data[b.key].total} empty={b.empty} detail={b.detail} daysLabel={b.daysLabel} />)}
        </div>
      )}
    </div>
  );
}
