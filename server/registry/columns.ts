/**
 * Database column of every registry field (explicit, so a renamed field is a type error here,
 * not a silent NULL). `kind` says how the pg value maps back (numeric comes back as a string).
 */
import type { CaseFieldName } from '../../shared/registry/case.js';
import type { TherapyFieldName } from '../../shared/registry/therapy.js';

export type ColumnKind = 'text' | 'bool' | 'int' | 'numeric' | 'date' | 'uuid' | 'text[]';
export interface ColumnSpec { column: string; kind: ColumnKind }

export const CASE_COLUMNS: Record<CaseFieldName, ColumnSpec> = {
  eligible: { column: 'eligible', kind: 'bool' },
  exclusionReason: { column: 'exclusion_reason', kind: 'text' },
  admissionDate: { column: 'admission_date', kind: 'date' },
  age: { column: 'age', kind: 'int' },
  sex: { column: 'sex', kind: 'text' },
  heightCm: { column: 'height_cm', kind: 'numeric' },
  weightKg: { column: 'weight_kg', kind: 'numeric' },
  asaClass: { column: 'asa_class', kind: 'text' },
  asaEmergency: { column: 'asa_emergency', kind: 'bool' },
  smokingStatus: { column: 'smoking_status', kind: 'text' },
  copd: { column: 'copd', kind: 'bool' },
  obstructiveSleepApnoea: { column: 'obstructive_sleep_apnoea', kind: 'bool' },
  heartFailure: { column: 'heart_failure', kind: 'bool' },
  preopSpO2: { column: 'preop_spo2', kind: 'int' },
  // Entered as { value, unit }; stored in g/dL.
  preopHaemoglobin: { column: 'preop_haemoglobin_g_dl', kind: 'numeric' },
  respiratoryInfectionLastMonth: { column: 'respiratory_infection_last_month', kind: 'bool' },
  functionalStatus: { column: 'functional_status', kind: 'text' },
  surgeryDate: { column: 'surgery_date', kind: 'date' },
  unitId: { column: 'unit_id', kind: 'uuid' },
  procedureCategory: { column: 'procedure_category', kind: 'text' },
  incisionSite: { column: 'incision_site', kind: 'text' },
  approach: { column: 'approach', kind: 'text' },
  urgency: { column: 'urgency', kind: 'text' },
  anaesthesia: { column: 'anaesthesia', kind: 'text' },
  durationMinutes: { column: 'duration_minutes', kind: 'int' },
  therapyGiven: { column: 'therapy_given', kind: 'bool' },
  complicationsReviewed: { column: 'complications_reviewed', kind: 'bool' },
  dischargeDate: { column: 'discharge_date', kind: 'date' },
  icuDays: { column: 'icu_days', kind: 'int' },
  ventilatorDays: { column: 'ventilator_days', kind: 'int' },
  readmitted30d: { column: 'readmitted_30d', kind: 'bool' },
  readmissionCause: { column: 'readmission_cause', kind: 'text' },
  died30d: { column: 'died_30d', kind: 'bool' },
  deathDate: { column: 'death_date', kind: 'date' },
  followUpCompletedOn: { column: 'follow_up_completed_on', kind: 'date' },
  notes: { column: 'notes', kind: 'text' },
};

export const THERAPY_COLUMNS: Record<TherapyFieldName, ColumnSpec> = {
  modality: { column: 'modality', kind: 'text' },
  startPostoperativeDay: { column: 'start_postoperative_day', kind: 'int' },
  endPostoperativeDay: { column: 'end_postoperative_day', kind: 'int' },
  prescribedSessionsPerDay: { column: 'prescribed_sessions_per_day', kind: 'int' },
  sessionsPrescribed: { column: 'sessions_prescribed', kind: 'int' },
  sessionsDelivered: { column: 'sessions_delivered', kind: 'int' },
  deliveredAbovePrescribedReason: { column: 'delivered_above_prescribed_reason', kind: 'text' },
  sessionMinutes: { column: 'session_minutes', kind: 'numeric' },
  interface: { column: 'interface', kind: 'text' },
  noseClip: { column: 'nose_clip', kind: 'bool' },
  aerosolMedication: { column: 'aerosol_medication', kind: 'bool' },
  sourceGas: { column: 'source_gas', kind: 'text' },
  flowLpm: { column: 'flow_lpm', kind: 'numeric' },
  expiratoryPressureCmH2O: { column: 'expiratory_pressure_cm_h2o', kind: 'numeric' },
  volumeTargetMl: { column: 'volume_target_ml', kind: 'int' },
  inspiratoryCapacityMl: { column: 'inspiratory_capacity_ml', kind: 'int' },
  vitalCapacityMl: { column: 'vital_capacity_ml', kind: 'int' },
  predictedBodyWeightKg: { column: 'predicted_body_weight_kg', kind: 'numeric' },
  tolerance: { column: 'tolerance', kind: 'text' },
  adverseEvents: { column: 'adverse_events', kind: 'text[]' },
  adverseEventNote: { column: 'adverse_event_note', kind: 'text' },
  stopReason: { column: 'stop_reason', kind: 'text' },
};

/** A pg value back to its JSON form (numeric strings to numbers, dates as YYYY-MM-DD). */
export function fromDb(kind: ColumnKind, v: unknown): unknown {
  if (v === null || v === undefined) return null;
  if (kind === 'numeric') return Number(v);
  if (kind === 'date') return v instanceof Date ? v.toISOString().slice(0, 10) : String(v).slice(0, 10);
  return v;
}
