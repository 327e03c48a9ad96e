import type { DataSource, EntityManager } from 'typeorm';
import { DEFAULT_THERAPY_CHECK_SETTINGS, TherapyCheckSettingsSchema, type TherapyCheckSettings } from '../../shared/clinical/modalities.js';

/** Network therapy-check settings (settings key `therapy-checks`), defaults when unset or invalid. */
export async function therapyCheckSettings(db: DataSource | EntityManager): Promise<TherapyCheckSettings> {
  const [row] = await db.query(`SELECT value FROM settings WHERE key = 'therapy-checks'`);
  const parsed = TherapyCheckSettingsSchema.safeParse(row?.value ?? {});
  return parsed.success ? parsed.data : DEFAULT_THERAPY_CHECK_SETTINGS;
}
