import { Column, Entity, PrimaryColumn } from 'typeorm';

/** For one month and measure: whether the committee saw a signal, and its discussion. */
@Entity({ name: 'committee_findings' })
export class CommitteeFinding {
  @PrimaryColumn({ type: 'date' }) month: string;
  @PrimaryColumn({ type: 'text', name: 'measure_key' }) measureKey: string;
  @Column({ type: 'boolean', name: 'signal_seen' }) signalSeen: boolean;
  @Column({ type: 'text', default: '' }) discussion: string;
  @Column({ type: 'uuid', name: 'updated_by', nullable: true }) updatedBy: string | null;
  @Column({ type: 'timestamptz', name: 'updated_at', default: () => 'now()' }) updatedAt: Date;
}
