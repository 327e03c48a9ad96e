/**
 * Demo data for the committee review (fictional, like the rest of the scenario): a note
 * "lung-expansion protocol introduced" pinned to each site's protocolStart month, and the
 * months whose cases the demo generator already locked recorded as closed (their inputs frozen
 * into the roll-up), so the newest months stay open for the chair to close.
 */
import { SITES } from './scenario.js';
import { demoSeedSteps } from './steps.js';
import { refreshRollup } from '../../measures/rollup.js';

demoSeedSteps.push({
  name: 'committee annotations and closed months',
  run: async (ds, log) => {
    await ds.transaction(async (tx) => {
      const [admin] = await tx.query(`SELECT id FROM users WHERE 'admin' = ANY(roles) ORDER BY created_at LIMIT 1`);
      for (const s of SITES) {
        await tx.query(
          `INSERT INTO committee_annotations (site_id, month, text, created_by) SELECT id, $2::date, $3, $4 FROM sites WHERE code = $1`,
          [s.code, `${s.protocolStart.slice(0, 7)}-01`, 'Lung-expansion protocol introduced', admin?.id ?? null],
        );
      }
      const months: { month: string; closed_at: string }[] = await tx.query(
        `SELECT to_char(date_trunc('month', surgery_date), 'YYYY-MM') AS month, max(locked_at) AS closed_at
           FROM surgical_cases WHERE status = 'locked' GROUP BY 1 ORDER BY 1`,
      );
      for (const m of months) {
        await refreshRollup(tx, m.month);
        await tx.query(`INSERT INTO committee_month_closes (month, closed, closed_at, closed_by) VALUES ($1::date, true, $2, $3)`, [`${m.month}-01`, m.closed_at, admin?.id ?? null]);
      }
      log(`committee: ${SITES.length} protocol notes, ${months.length} months recorded as closed`);
    });
  },
});
