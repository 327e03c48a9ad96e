import { Check, Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import type { Site } from './site.js';
import type { Unit } from './unit.js';

/**
 * One pseudonymised surgical case (shared/registry/case.ts describes each field). No direct
 * identifier is stored: the hospital's identifier, when typed, is kept only as a keyed hash.
 * Numeric columns come back from pg as strings: the data access maps them.
 *
 * Indexes written by hand in the migration (descending, partial, pattern ops) are declared
 * with `synchronize: false` so that migration:generate leaves them alone.
 */
@Entity({ name: 'surgical_cases' })
@Check('CHK_cases_status', `"status" IN ('draft', 'complete', 'verified', 'locked', 'withdrawn')`)
@Check('CHK_cases_version', `"version" >= 1`)
@Index(['siteId', 'registryYear', 'registrySeq'], { unique: true })
@Index('IDX_cases_site_surgery', { synchronize: false })
@Index('IDX_cases_surgery', { synchronize: false })
@Index('IDX_cases_site_status_surgery', { synchronize: false })
@Index('IDX_cases_site_category_surgery', { synchronize: false })
@Index('IDX_cases_site_class_surgery', { synchronize: false })
@Index('IDX_cases_site_updated', { synchronize: false })
@Index('IDX_cases_registry_number_pattern', { synchronize: false })
@Index('IDX_cases_identifier_hash', { synchronize: false })
@Index('IDX_cases_followup_open', { synchronize: false })
@Index('IDX_cases_site_status_ariscat', { synchronize: false })
@Index('IDX_cases_worklist_open', { synchronize: false })
@Index('IDX_cases_worklist_complete', { synchronize: false })
export class SurgicalCase {
  @PrimaryGeneratedColumn('uuid') id: string;
  @Column({ type: 'text', name: 'registry_number', unique: true }) registryNumber: string;
  @Column({ type: 'integer', name: 'registry_year' }) registryYear: number;
  @Column({ type: 'integer', name: 'registry_seq' }) registrySeq: number;
  @Column({ type: 'uuid', name: 'site_id' }) siteId: string;
  @ManyToOne('Site', { onDelete: 'RESTRICT' }) @JoinColumn({ name: 'site_id' }) site: Site;
  @Column({ type: 'uuid', name: 'unit_id', nullable: true }) unitId: string | null;
  @ManyToOne('Unit', { onDelete: 'RESTRICT' }) @JoinColumn({ name: 'unit_id' }) unit: Unit;
  @Column({ type: 'text', default: 'draft' }) status: string;
  @Column({ type: 'integer', default: 1 }) version: number;
  @Column({ type: 'text', name: 'created_via', default: 'form' }) createdVia: string;

  // Patient and surveillance population
  @Column({ type: 'boolean', nullable: true }) eligible: boolean | null;
  @Column({ type: 'text', name: 'exclusion_reason', nullable: true }) exclusionReason: string | null;
  @Column({ type: 'date', name: 'admission_date', nullable: true }) admissionDate: string | null;
  @Column({ type: 'smallint', nullable: true }) age: number | null;
  @Column({ type: 'text', nullable: true }) sex: string | null;
  @Column({ type: 'numeric', name: 'height_cm', precision: 5, scale: 1, nullable: true }) heightCm: string | null;
  @Column({ type: 'numeric', name: 'weight_kg', precision: 5, scale: 1, nullable: true }) weightKg: string | null;
  @Column({ type: 'text', name: 'asa_class', nullable: true }) asaClass: string | null;
  @Column({ type: 'boolean', name: 'asa_emergency', nullable: true }) asaEmergency: boolean | null;
  @Column({ type: 'text', name: 'smoking_status', nullable: true }) smokingStatus: string | null;
  @Column({ type: 'boolean', nullable: true }) copd: boolean | null;
  @Column({ type: 'boolean', name: 'obstructive_sleep_apnoea', nullable: true }) obstructiveSleepApnoea: boolean | null;
  @Column({ type: 'boolean', name: 'heart_failure', nullable: true }) heartFailure: boolean | null;
  @Column({ type: 'smallint', name: 'preop_spo2', nullable: true }) preopSpO2: number | null;
  /** Stored in g/dL whatever unit it was entered in (shared/clinical/units.ts). */
  @Column({ type: 'numeric', name: 'preop_haemoglobin_g_dl', precision: 4, scale: 2, nullable: true }) preopHaemoglobinGdl: string | null;
  @Column({ type: 'boolean', name: 'respiratory_infection_last_month', nullable: true }) respiratoryInfectionLastMonth: boolean | null;
  @Column({ type: 'text', name: 'functional_status', nullable: true }) functionalStatus: string | null;

  // Operation
  @Column({ type: 'date', name: 'surgery_date' }) surgeryDate: string;
  @Column({ type: 'text', name: 'procedure_category', nullable: true }) procedureCategory: string | null;
  @Column({ type: 'text', name: 'incision_site', nullable: true }) incisionSite: string | null;
  @Column({ type: 'text', nullable: true }) approach: string | null;
  @Column({ type: 'text', nullable: true }) urgency: string | null;
  @Column({ type: 'text', nullable: true }) anaesthesia: string | null;
  @Column({ type: 'integer', name: 'duration_minutes', nullable: true }) durationMinutes: number | null;
  @Column({ type: 'smallint', name: 'ariscat_points', nullable: true }) ariscatPoints: number | null;
  @Column({ type: 'text', name: 'ariscat_class', nullable: true }) ariscatClass: string | null;

  // Therapy and outcomes (case-level answers)
  @Column({ type: 'boolean', name: 'therapy_given', nullable: true }) therapyGiven: boolean | null;
  @Column({ type: 'boolean', name: 'complications_reviewed', nullable: true }) complicationsReviewed: boolean | null;

  // Follow-up
  @Column({ type: 'date', name: 'discharge_date', nullable: true }) dischargeDate: string | null;
  @Column({ type: 'smallint', name: 'icu_days', nullable: true }) icuDays: number | null;
  @Column({ type: 'smallint', name: 'ventilator_days', nullable: true }) ventilatorDays: number | null;
  @Column({ type: 'boolean', name: 'readmitted_30d', nullable: true }) readmitted30d: boolean | null;
  @Column({ type: 'text', name: 'readmission_cause', nullable: true }) readmissionCause: string | null;
  @Column({ type: 'boolean', name: 'died_30d', nullable: true }) died30d: boolean | null;
  @Column({ type: 'date', name: 'death_date', nullable: true }) deathDate: string | null;
  @Column({ type: 'date', name: 'follow_up_completed_on', nullable: true }) followUpCompletedOn: string | null;
  @Column({ type: 'text', nullable: true }) notes: string | null;

  // De-identification: HMAC of site + normalised local identifier; never the identifier itself.
  @Column({ type: 'text', name: 'identifier_hash', nullable: true }) identifierHash: string | null;
  @Column({ type: 'boolean', name: 'possible_duplicate', default: false }) possibleDuplicate: boolean;
  /** Stored warnings (ASA E vs urgency, ...), shown on the case until resolved. */
  @Column({ type: 'jsonb', default: () => "'[]'" }) warnings: unknown[];

  // Workflow
  @Column({ type: 'uuid', name: 'created_by', nullable: true }) createdBy: string | null;
  @CreateDateColumn({ type: 'timestamptz', name: 'created_at' }) createdAt: Date;
  @Column({ type: 'uuid', name: 'updated_by', nullable: true }) updatedBy: string | null;
  @Column({ type: 'timestamptz', name: 'updated_at', default: () => 'now()' }) updatedAt: Date;
  /** Everyone who changed the case since its last verification (none of them may verify it). */
  @Column({ type: 'uuid', name: 'editors_since_verification', array: true, default: () => "'{}'" }) editorsSinceVerification: string[];
  @Column({ type: 'timestamptz', name: 'completed_at', nullable: true }) completedAt: Date | null;
  @Column({ type: 'uuid', name: 'verified_by', nullable: true }) verifiedBy: string | null;
  @Column({ type: 'timestamptz', name: 'verified_at', nullable: true }) verifiedAt: Date | null;
  @Column({ type: 'uuid', name: 'locked_by', nullable: true }) lockedBy: string | null;
  @Column({ type: 'timestamptz', name: 'locked_at', nullable: true }) lockedAt: Date | null;
  @Column({ type: 'uuid', name: 'withdrawn_by', nullable: true }) withdrawnBy: string | null;
  @Column({ type: 'timestamptz', name: 'withdrawn_at', nullable: true }) withdrawnAt: Date | null;
  @Column({ type: 'text', name: 'withdrawn_reason', nullable: true }) withdrawnReason: string | null;
}
