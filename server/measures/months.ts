/** Month arithmetic on 'YYYY-MM' strings (the surveillance month) and their first days. */
import { todayIn } from '../../shared/registry/derived.js';

export function monthStart(month: string): string {
  return `${month}-01`;
}

export function toMonth(date: string): string {
  return date.slice(0, 7);
}

export function addMonths(month: string, k: number): string {
  const [y, m] = month.split('-').map(Number);
  const t = y * 12 + (m - 1) + k;
  return `${Math.floor(t / 12)}-${String((t % 12) + 1).padStart(2, '0')}`;
}

/** Every month from a to b inclusive (empty when b < a). */
export function monthRange(a: string, b: string): string[] {
  const out: string[] = [];
  for (let m = a; m <= b; m = addMonths(m, 1)) out.push(m);
  return out;
}

export function quarterOf(month: string): string {
  const [y, m] = month.split('-').map(Number);
  return `${y}-Q${Math.floor((m - 1) / 3) + 1}`;
}

/** The current month in the network time zone. */
export function currentMonth(timeZone: string, now = new Date()): string {
  return todayIn(timeZone, now).slice(0, 7);
}

export function monthLabel(period: string): string {
  if (period.includes('Q')) return period.replace('-', ' ');
  const [y, m] = period.split('-').map(Number);
  return `${['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'][m - 1]} ${y}`;
}
