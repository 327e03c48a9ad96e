import { Column, Entity, PrimaryColumn } from 'typeorm';

/** An administrator's settings for one committee measure (shared/committee/measures.ts): on/off and baseline months. */
@Entity({ name: 'committee_measure_settings' })
export class CommitteeMeasureSetting {
  @PrimaryColumn({ type: 'text', name: 'measure_key' }) measureKey: string;
  @Column({ type: 'boolean', default: true }) enabled: boolean;
  /** First and last month (first day of the month) of the baseline; null = the first 12 months. */
  @Column({ type: 'date', name: 'baseline_start', nullable: true }) baselineStart: string | null;
  @Column({ type: 'date', name: 'baseline_end', nullable: true }) baselineEnd: string | null;
  @Column({ type: 'uuid', name: 'updated_by', nullable: true }) updatedBy: string | null;
  @Column({ type: 'timestamptz', name: 'updated_at', default: () => 'now()' }) updatedAt: Date;
}
