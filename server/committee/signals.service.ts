/**
 * Between meetings: when a month is closed, every enabled measure is charted for the network
 * and each site on the data up to that month; a signal whose span reaches the newly closed month
 * and that was not e-mailed before is sent to the committee and the site's analysts, naming the
 * measure, the site and the rule. Also: the reminder of overdue actions to their owner.
 */
import type { DataSource } from 'typeorm';
import type { AppContext } from '../context.js';
import type { ChartResponse, ChartSignal } from '../../shared/committee/chart.js';
import { MEASURES } from '../../shared/committee/measures.js';
import { todayIn } from '../../shared/registry/derived.js';
import { readMonthly } from '../measures/rollup.js';
import { chartFromPeriods, closedMonths, measureSettings, periodsFromRows, firstDataMonth } from '../measures/measures.service.js';
import { monthLabel, monthRange } from '../measures/months.js';
import { logger } from '../logger.js';

export interface ScopeCharts { site: string; siteCode: string | null; label: string; charts: ChartResponse[] }

/** Every enabled measure's monthly chart, for the network and each site, over [from, to]. */
export async function allCharts(ds: DataSource, to: string, from?: string): Promise<ScopeCharts[]> {
  const settings = await measureSettings(ds);
  const closed = await closedMonths(ds);
  const first = from ?? (await firstDataMonth(ds)) ?? to;
  // The same window as a chart asked without a start: at most the latest 120 months (chartMonths).
  const months = monthRange(first <= to ? first : to, to).slice(from ? 0 : -120);
  const rows = await readMonthly(ds, months[0], months[months.length - 1], closed, null);
  const sites: { id: string; code: string; name: string }[] = await ds.query(`SELECT id, code, name FROM sites WHERE active ORDER BY code`);
  const scopes = [{ site: 'network', siteCode: null as string | null }, ...sites.map((s) => ({ site: s.id, siteCode: s.code }))];
  const out: ScopeCharts[] = [];
  for (const scope of scopes) {
    const scoped = scope.site === 'network' ? rows : rows.filter((r) => r.siteId === scope.site);
    const charts: ChartResponse[] = [];
    for (const m of MEASURES) {
      const s = settings.get(m.key)!;
      if (!s.enabled) continue;
      const ms = s.baselineStart && s.baselineStart > months[0] ? months.filter((x) => x >= s.baselineStart!) : months;
      if (!ms.length) continue;
      const periods = periodsFromRows(m, ms, 'monthly', closed, scoped.filter((r) => r.month >= ms[0]));
      charts.push(await chartFromPeriods(ds, m.key, { site: scope.site, view: 'monthly', rebase: [] }, s, periods));
    }
    out.push({ ...scope, label: charts[0]?.scope.label ?? scope.site, charts });
  }
  return out;
}

async function recipients(ds: DataSource, site: string): Promise<string[]> {
  const rows: { email: string }[] = await ds.query(
    `SELECT DISTINCT u.email FROM users u
      WHERE u.active AND ('committee' = ANY(u.roles)
         OR ('analyst' = ANY(u.roles) AND ($1::uuid IS NULL OR EXISTS (SELECT 1 FROM user_sites us WHERE us.user_id = u.id AND us.site_id = $1::uuid))))
      ORDER BY u.email`,
    [site === 'network' ? null : site],
  );
  return rows.map((r) => r.email);
}

const touches = (s: ChartSignal, month: string) => s.startPeriod <= month && s.endPeriod >= month;

/**
 * E-mails the signals that the newly closed month produced (once each); returns how many.
 * @param baseUrl the app's address for the link in the message
 */
export async function notifyNewSignals(context: AppContext, month: string, baseUrl: string): Promise<number> {
  const { ds, mailer } = context;
  const scopes = await allCharts(ds, month);
  let sent = 0;
  for (const scope of scopes) {
    const fresh: { chart: ChartResponse; signal: ChartSignal }[] = [];
    for (const chart of scope.charts) {
      for (const signal of chart.signals.filter((s) => touches(s, month))) {
        const res = await ds.query(
          `INSERT INTO committee_signal_notices (measure_key, scope, rule, start_period, end_period) VALUES ($1, $2, $3, $4, $5)
           ON CONFLICT DO NOTHING RETURNING measure_key`,
          [chart.measure.key, scope.site, `${signal.chart}:${signal.rule}`, signal.startPeriod, signal.endPeriod],
        );
        if ((Array.isArray(res[0]) ? res[0] : res).length) fresh.push({ chart, signal });
      }
    }
    if (!fresh.length) continue;
    const to = await recipients(ds, scope.site);
    if (!to.length) continue;
    const measures = [...new Set(fresh.map((f) => f.chart.measure.short))];
    const lines = fresh.map((f) => [
      `- ${f.chart.measure.label} — ${scope.label}`,
      `  Rule: ${f.signal.label} (${f.signal.chart === 'run' ? 'run chart' : f.chart.measure.chart}), ${monthLabel(f.signal.startPeriod)} to ${monthLabel(f.signal.endPeriod)}`,
      `  ${f.signal.explanation}`,
    ].join('\n'));
    await mailer.send({
      to,
      subject: `Alveolog: new signal${fresh.length === 1 ? '' : 's'} for ${measures.join(', ')} at ${scope.siteCode ?? 'network level'} (${monthLabel(month)} closed)`,
      text: [
        `Closing ${monthLabel(month)} produced ${fresh.length} new signal${fresh.length === 1 ? '' : 's'} at ${scope.label}:`,
        '',
        ...lines,
        '',
        `Open the charts: ${baseUrl}/committee/charts?site=${scope.site}`,
        '',
        'A signal is a prompt to look for a cause, not a verdict. Surveillance and quality improvement only; local protocol and the clinician\'s judgement decide care.',
      ].join('\n'),
    });
    sent += fresh.length;
  }
  return sent;
}

/**
 * Reminds each owner of their open actions past the due date (at most once a week per action).
 * @param today YYYY-MM-DD in the network time zone
 */
export async function remindOverdueActions(context: AppContext, today: string, baseUrl: string): Promise<number> {
  const { ds, mailer } = context;
  const rows: { id: string; email: string; name: string; description: string; due: string; measure_key: string; month: string }[] = await ds.query(
    `SELECT a.id, u.email, u.display_name AS name, a.description, to_char(a.due_date, 'YYYY-MM-DD') AS due, a.measure_key, to_char(a.month, 'YYYY-MM') AS month
       FROM committee_actions a JOIN users u ON u.id = a.owner_id
      WHERE a.status = 'open' AND a.due_date < $1::date AND u.active
        AND (a.last_reminded_at IS NULL OR a.last_reminded_at < now() - interval '7 days')
      ORDER BY u.email, a.due_date`,
    [today],
  );
  const byOwner = new Map<string, typeof rows>();
  for (const r of rows) byOwner.set(r.email, [...(byOwner.get(r.email) ?? []), r]);
  for (const [email, list] of byOwner) {
    const label = (k: string) => MEASURES.find((m) => m.key === k)?.short ?? k;
    await mailer.send({
      to: email,
      subject: `Alveolog: ${list.length} committee action${list.length === 1 ? ' is' : 's are'} overdue`,
      text: [
        `Hello ${list[0].name},`, '',
        `These committee actions you own are past their due date:`,
        ...list.map((a) => `- ${a.description} (${label(a.measure_key)}, review of ${monthLabel(a.month)}; due ${a.due})`),
        '', `Mark them done or agree a new date: ${baseUrl}/committee/actions`,
      ].join('\n'),
    });
    await ds.query(`UPDATE committee_actions SET last_reminded_at = now() WHERE id = ANY($1::uuid[])`, [list.map((a) => a.id)]);
  }
  return rows.length;
}

/** The scheduled run: today's date in the network time zone, the link from APP_URL. */
export async function runReminderSchedule(context: AppContext): Promise<void> {
  const today = todayIn(context.config.NETWORK_TIME_ZONE, new Date());
  const n = await remindOverdueActions(context, today, context.config.APP_URL ?? `http://localhost:${context.config.PORT}`);
  if (n) logger.info({ reminded: n }, 'overdue committee actions reminded');
}
