import { Column, Entity, PrimaryColumn } from 'typeorm';

/**
 * The committee measures' monthly inputs of one site, frozen when the month is closed
 * (server/measures/rollup.ts). Closed months are read from here, open months live from the
 * registry, so a 60-month chart reads a few hundred rows instead of every case.
 */
@Entity({ name: 'committee_month_rollups' })
export class CommitteeMonthRollup {
  @PrimaryColumn({ type: 'uuid', name: 'site_id' }) siteId: string;
  @PrimaryColumn({ type: 'date' }) month: string;
  @Column({ type: 'integer' }) cases: number;
  @Column({ type: 'integer', name: 'any_ppc' }) anyPpc: number;
  @Column({ type: 'integer' }) atelectasis: number;
  @Column({ type: 'integer' }) pneumonia: number;
  @Column({ type: 'integer', name: 'pneumonia_discharged' }) pneumoniaDischarged: number;
  @Column({ type: 'integer', name: 'discharged_cases' }) dischargedCases: number;
  @Column({ type: 'integer', name: 'patient_days' }) patientDays: number;
  @Column({ type: 'integer', name: 'followed_up' }) followedUp: number;
  @Column({ type: 'integer', name: 'respiratory_readmissions' }) respiratoryReadmissions: number;
  @Column({ type: 'integer', name: 'at_risk' }) atRisk: number;
  @Column({ type: 'integer', name: 'early_therapy' }) earlyTherapy: number;
  @Column({ type: 'integer', name: 'adherence_cases' }) adherenceCases: number;
  @Column({ type: 'float8', name: 'adherence_sum' }) adherenceSum: number;
  /** Length-of-stay frequency table: [[days, cases], ...]. */
  @Column({ type: 'jsonb', name: 'los_frequencies', default: () => "'[]'" }) losFrequencies: [number, number][];
  @Column({ type: 'timestamptz', name: 'computed_at', default: () => 'now()' }) computedAt: Date;
}
