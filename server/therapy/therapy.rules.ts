/**
 * Checks one therapy episode in the context of its case: the schema's contradictions, the
 * modality table (analysis/clinical `checkTherapyEpisode`: fields that apply, possible and usual
 * ranges, session length) and the lung-expansion indication (inspiratory or vital capacity under
 * 10 mL/kg of predicted body weight). Errors are a 400; warnings are stored with the episode and
 * carry the caution that local protocol and the clinician's judgement decide.
 */
import { checkTherapyEpisode } from '../../analysis/clinical/therapy-checks.js';
import { lungExpansionIndication, predictedBodyWeight } from '../../analysis/clinical/body.js';
import { fieldAppliesTo, type TherapyCheckSettings, type TherapyEpisodeCheckInput } from '../../shared/clinical/modalities.js';
import type { Sex } from '../../shared/clinical/codes.js';
import { therapyContradictions, type TherapyEpisodeFields } from '../../shared/registry/therapy.js';
import type { ErrorField } from '../../shared/api/error.js';
import type { CaseFields } from '../../shared/registry/case.js';

export interface EpisodeCheck { errors: ErrorField[]; warnings: { path: string; message: string }[]; fields: TherapyEpisodeFields }

export function checkEpisode(input: TherapyEpisodeFields, kase: Pick<CaseFields, 'heightCm' | 'sex'>, settings: TherapyCheckSettings): EpisodeCheck {
  const fields: TherapyEpisodeFields = { ...input };
  const errors: ErrorField[] = therapyContradictions(fields).map((c) => ({ path: c.path, message: c.message }));
  const measured = fields.inspiratoryCapacityMl != null || fields.vitalCapacityMl != null;
  const body = kase.heightCm != null && kase.sex ? { heightCm: kase.heightCm, sex: kase.sex as Sex } : null;
  // The predicted body weight used: from the case's height and sex when not entered.
  if (measured && fields.predictedBodyWeightKg == null && body && fieldAppliesTo(fields.modality, 'predictedBodyWeightKg')) {
    try {
      fields.predictedBodyWeightKg = Math.round(predictedBodyWeight(body.heightCm, body.sex) * 10) / 10;
    } catch {
      // Height outside the formula's range: leave it empty.
    }
  }
  const r = checkTherapyEpisode(fields as TherapyEpisodeCheckInput, settings);
  const dup = errors.some((e) => e.path === 'deliveredAbovePrescribedReason');
  for (const e of r.errors) if (!(dup && e.path === 'sessionsDelivered')) errors.push({ path: e.path, message: `${e.message}; ${e.hint}` });
  const warnings = r.warnings.map((w) => ({ path: w.path, message: w.message }));
  if (measured && body && !errors.length) {
    try {
      const ind = lungExpansionIndication({ inspiratoryCapacityMl: fields.inspiratoryCapacityMl, vitalCapacityMl: fields.vitalCapacityMl, heightCm: body.heightCm, sex: body.sex });
      if (ind.incentiveSpirometryLikelyInadequate && ind.message) warnings.push({ path: fields.inspiratoryCapacityMl != null ? 'inspiratoryCapacityMl' : 'vitalCapacityMl', message: `${ind.message} ${ind.caution}` });
    } catch {
      // Height outside the formula's range: no indication check.
    }
  }
  return { errors, warnings, fields };
}
