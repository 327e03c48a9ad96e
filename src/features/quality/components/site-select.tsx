import { inputClass } from '../../../components/ui.js';
import { useSession } from '../../../lib/session.js';
import { useSites } from '../api/get-sites.js';

/** A site filter limited to the signed-in user's sites ("" = all of them). */
export function SiteSelect({ id, value, onChange, allLabel = 'All my sites' }: { id: string; value: string; onChange: (v: string) => void; allLabel?: string }) {
  const sites = useSites();
  const user = useSession().data?.user;
  const mine = (sites.data?.items ?? []).filter((s) => user?.roles.includes('admin') || user?.siteIds.includes(s.id));
  return (
    <select id={id} className={inputClass} value={value} onChange={(e) => onChange(e.target.value)}>
      <option value="">{allLabel}</option>
      {mine.map((s) => <option key={s.id} value={s.id}>{s.code} — {s.name}</option>)}
    </select>
  );
}

export function useMySites() {
  const sites = useSites();
  const user = useSession().data?.user;
  return (sites.data?.items ?? []).filter((s) => user?.roles.includes('admin') || user?.siteIds.includes(s.id));
}
