import { Column, Entity, PrimaryColumn } from 'typeorm';

/** A surveillance month of the network: closed (its cases locked) and published, or open. History is in the audit trail. */
@Entity({ name: 'committee_month_closes' })
export class CommitteeMonthClose {
  /** First day of the month. */
  @PrimaryColumn({ type: 'date' }) month: string;
  @Column({ type: 'boolean', default: false }) closed: boolean;
  @Column({ type: 'timestamptz', name: 'closed_at', nullable: true }) closedAt: Date | null;
  @Column({ type: 'uuid', name: 'closed_by', nullable: true }) closedBy: string | null;
  @Column({ type: 'timestamptz', name: 'published_at', nullable: true }) publishedAt: Date | null;
  @Column({ type: 'uuid', name: 'published_by', nullable: true }) publishedBy: string | null;
  @Column({ type: 'uuid', name: 'packet_job_id', nullable: true }) packetJobId: string | null;
}
