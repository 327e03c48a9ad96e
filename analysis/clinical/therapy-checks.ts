/**
 * Checks one lung-expansion therapy episode against its modality's table (fields that apply,
 * possible and usual ranges, session length) from `shared/clinical/modalities.ts`.
 *
 * Sources of the figures are in the tables: positive expiratory pressure usually 10–20 cm H2O,
 * CPAP and positive-airway-pressure devices usually 5–20 cm H2O (AARC CPG, Respir Care 1993);
 * flowmeters 0–15 L/min and the 60-minute session default (common practice, no source).
 * Errors block storing; warnings are stored and always carry the caution that local protocol
 * and the clinician's judgement decide (surveillance and quality improvement only).
 */
import { CLINICAL_CAUTION, cautionWarning, type CheckError, type CheckResult, type CheckWarning } from '../../shared/clinical/checks.js';
import { THERAPY_MODALITIES, THERAPY_MODALITY_LABELS } from '../../shared/clinical/codes.js';
import {
  DEFAULT_THERAPY_CHECK_SETTINGS,
  MODALITY_TABLES,
  NUMERIC_EPISODE_FIELDS,
  THERAPY_EPISODE_FIELD_LABELS,
  TherapyCheckSettingsSchema,
  TherapyEpisodeFieldSchema,
  type NumericEpisodeField,
  type TherapyCheckSettings,
  type TherapyEpisodeCheckInput,
  type TherapyEpisodeField,
} from '../../shared/clinical/modalities.js';
import { AnalysisInputError } from '../errors.js';
import { requireObject } from './require.js';

const isNumericField = (f: TherapyEpisodeField): f is NumericEpisodeField => (NUMERIC_EPISODE_FIELDS as readonly string[]).includes(f);
const BOOLEAN_FIELDS: readonly TherapyEpisodeField[] = ['noseClip', 'aerosolMedication'];

/**
 * Checks a therapy episode.
 *
 * @param episode the episode's modality and settings (other properties are ignored)
 * @param settings network settings; `sessionLengthWarnMinutes` defaults to 60
 * @returns `errors` ({ path, message, hint }: not storable) and `warnings` ({ path, message,
 *   detail, caution }: stored, shown with the caution)
 * @throws AnalysisInputError when the episode is not an object or the settings are invalid
 * @example checkTherapyEpisode({ modality: 'cpap', expiratoryPressureCmH2O: 22 })
 *   // warnings: [{ path: 'expiratoryPressureCmH2O', message: 'Expiratory pressure reached 22 cm H2O is
 *   //   outside the usual 5–20 cm H2O for CPAP (lung expansion)… Local protocol and …' }]
 */
export function checkTherapyEpisode(
  episode: TherapyEpisodeCheckInput,
  settings: Partial<TherapyCheckSettings> = DEFAULT_THERAPY_CHECK_SETTINGS,
): CheckResult {
  const fn = 'checkTherapyEpisode';
  requireObject(fn, 'episode', episode);
  const parsedSettings = TherapyCheckSettingsSchema.safeParse(settings ?? {});
  if (!parsedSettings.success) {
    const issue = parsedSettings.error.issues[0];
    throw new AnalysisInputError(fn, `settings.${issue.path.map(String).join('.')}`, `is not valid: ${issue.message}`);
  }
  const { sessionLengthWarnMinutes } = parsedSettings.data;
  const errors: CheckError[] = [];
  const warnings: CheckWarning[] = [];

  const modality = episode.modality;
  if (typeof modality !== 'string' || !(THERAPY_MODALITIES as readonly string[]).includes(modality)) {
    errors.push({ path: 'modality', message: `modality "${String(modality)}" is not known`, hint: `choose one of ${THERAPY_MODALITIES.join(', ')}` });
    return { errors, warnings };
  }
  const table = MODALITY_TABLES[modality];
  const modalityLabel = THERAPY_MODALITY_LABELS[modality];
  const raw = episode as unknown as Record<string, unknown>;

  for (const field of TherapyEpisodeFieldSchema.options) {
    const value = raw[field];
    if (value === undefined || value === null) continue;
    const label = THERAPY_EPISODE_FIELD_LABELS[field];
    if (!table.fields.includes(field)) {
      errors.push({
        path: field,
        message: `${label} does not apply to ${modalityLabel}`,
        hint:
          modality === 'incentive-spirometry'
            ? 'clear it: incentive spirometry has a volume target and no flow or pressure setting'
            : 'clear it, or choose the modality it belongs to',
      });
      continue;
    }
    if (isNumericField(field)) {
      const spec = table.numeric[field];
      if (typeof value !== 'number' || !Number.isFinite(value)) {
        errors.push({ path: field, message: `${label} must be a number`, hint: `enter it in ${spec?.unit ?? 'its unit'}` });
        continue;
      }
      if (!spec) continue;
      if (spec.integer && !Number.isInteger(value)) {
        errors.push({ path: field, message: `${label} must be a whole number (got ${value})`, hint: 'enter a whole number' });
        continue;
      }
      const { possible, usual } = spec;
      if (value < possible.min || value > possible.max) {
        errors.push({
          path: field,
          message: `${label} ${value} ${spec.unit} is outside the possible ${possible.min}–${possible.max} ${spec.unit} for ${modalityLabel}`,
          hint: `check the number and its unit; enter a value from ${possible.min} to ${possible.max} ${spec.unit}`,
        });
        continue;
      }
      if (usual && (value < usual.min || value > usual.max)) {
        warnings.push(
          cautionWarning(
            field,
            `${label} ${value} ${spec.unit} is outside the usual ${usual.min}–${usual.max} ${spec.unit} for ${modalityLabel} (${usual.source}).`,
          ),
        );
      }
      continue;
    }
    if (BOOLEAN_FIELDS.includes(field) && typeof value !== 'boolean') {
      errors.push({ path: field, message: `${label} must be yes or no`, hint: 'answer yes or no' });
      continue;
    }
    if (field === 'interface' && table.interfaces && !table.interfaces.includes(value as never)) {
      errors.push({
        path: field,
        message: `interface "${String(value)}" does not fit ${modalityLabel}`,
        hint: `use ${table.interfaces.join(' or ')}`,
      });
    }
    if (field === 'sourceGas' && value !== 'air' && value !== 'oxygen') {
      errors.push({ path: field, message: `source gas "${String(value)}" is not known`, hint: 'use air or oxygen' });
    }
  }

  const minutes = raw.sessionMinutes;
  if (
    table.sessionLengthWarning &&
    typeof minutes === 'number' &&
    Number.isFinite(minutes) &&
    minutes > sessionLengthWarnMinutes &&
    !errors.some((e) => e.path === 'sessionMinutes')
  ) {
    warnings.push(
      cautionWarning(
        'sessionMinutes',
        `One session of ${minutes} min is longer than ${sessionLengthWarnMinutes} min: lung-expansion therapy is usually given intermittently, not for extended periods (common practice).`,
      ),
    );
  }

  const delivered = raw.sessionsDelivered;
  const prescribed = raw.sessionsPrescribed;
  const reason = typeof raw.deliveredAbovePrescribedReason === 'string' ? raw.deliveredAbovePrescribedReason.trim() : '';
  if (
    typeof delivered === 'number' &&
    typeof prescribed === 'number' &&
    delivered > prescribed &&
    reason === '' &&
    !errors.some((e) => e.path === 'sessionsDelivered' || e.path === 'sessionsPrescribed')
  ) {
    errors.push({
      path: 'sessionsDelivered',
      message: `${delivered} sessions delivered is more than the ${prescribed} prescribed`,
      hint: 'correct the counts, or give the reason in deliveredAbovePrescribedReason',
    });
  }

  return { errors, warnings };
}

/** The caution shown with every therapy warning (re-exported for screens). */
export const THERAPY_CAUTION = CLINICAL_CAUTION;
