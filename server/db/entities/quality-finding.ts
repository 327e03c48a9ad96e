import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/**
 * A definition-consistency finding about one case. `fingerprint` (kind + case + what was found)
 * lets a re-run update a finding instead of repeating it; a finding no longer found is resolved.
 */
@Entity({ name: 'quality_findings' })
@Index(['fingerprint'], { unique: true })
@Index(['siteId', 'status', 'kind'])
@Index(['caseId'])
export class QualityFinding {
  @PrimaryGeneratedColumn('uuid') id: string;
  @Column({ type: 'text' }) kind: string;
  @Column({ type: 'uuid', name: 'case_id' }) caseId: string;
  @Column({ type: 'uuid', name: 'site_id' }) siteId: string;
  @Column({ type: 'text' }) fingerprint: string;
  @Column({ type: 'text' }) message: string;
  @Column({ type: 'jsonb', default: () => "'{}'" }) details: Record<string, unknown>;
  @Column({ type: 'text', default: 'open' }) status: 'open' | 'reviewed' | 'resolved';
  @Column({ type: 'timestamptz', name: 'first_found_at', default: () => 'now()' }) firstFoundAt: Date;
  @Column({ type: 'timestamptz', name: 'last_found_at', default: () => 'now()' }) lastFoundAt: Date;
  @Column({ type: 'uuid', name: 'last_job_id', nullable: true }) lastJobId: string | null;
  @Column({ type: 'uuid', name: 'reviewed_by', nullable: true }) reviewedBy: string | null;
  @Column({ type: 'timestamptz', name: 'reviewed_at', nullable: true }) reviewedAt: Date | null;
  @Column({ type: 'text', name: 'review_reason', nullable: true }) reviewReason: string | null;
}
