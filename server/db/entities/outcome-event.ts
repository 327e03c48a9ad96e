import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import type { SurgicalCase } from './surgical-case.js';

/**
 * One post-operative pulmonary complication of a case. Its evidence is a list of dated
 * observations (JSON checked by shared/clinical/observations.ts, measured values converted to
 * the stored unit); `evaluations` holds each definition's result with its name and version.
 * Never hard-deleted: `removed_at`.
 */
@Entity({ name: 'outcome_events' })
@Index(['caseId'])
@Index(['type', 'caseId'])
export class OutcomeEventRow {
  @PrimaryGeneratedColumn('uuid') id: string;
  @Column({ type: 'uuid', name: 'case_id' }) caseId: string;
  @ManyToOne('SurgicalCase', { onDelete: 'RESTRICT' }) @JoinColumn({ name: 'case_id' }) surgicalCase: SurgicalCase;
  @Column({ type: 'text' }) type: string;
  @Column({ type: 'smallint', name: 'onset_postoperative_day' }) onsetPostoperativeDay: number;
  @Column({ type: 'text', name: 'clavien_dindo', nullable: true }) clavienDindo: string | null;
  @Column({ type: 'boolean', name: 'clavien_dindo_disability', nullable: true }) clavienDindoDisability: boolean | null;
  @Column({ type: 'jsonb', default: () => "'[]'" }) observations: unknown[];
  @Column({ type: 'text', nullable: true }) notes: string | null;
  /** The definition the event is judged under, and its version. */
  @Column({ type: 'text' }) definition: string;
  @Column({ type: 'text', name: 'definition_version' }) definitionVersion: string;
  @Column({ type: 'jsonb', default: () => "'[]'" }) evaluations: unknown[];
  /** Copy of the stored PNU1 result (for filters and the views). */
  @Column({ type: 'boolean', name: 'pneumonia_nhsn_met', default: false }) pneumoniaNhsnMet: boolean;
  @Column({ type: 'uuid', name: 'created_by', nullable: true }) createdBy: string | null;
  @CreateDateColumn({ type: 'timestamptz', name: 'created_at' }) createdAt: Date;
  @Column({ type: 'timestamptz', name: 'updated_at', default: () => 'now()' }) updatedAt: Date;
  @Column({ type: 'timestamptz', name: 'removed_at', nullable: true }) removedAt: Date | null;
  @Column({ type: 'uuid', name: 'removed_by', nullable: true }) removedBy: string | null;
  @Column({ type: 'text', name: 'removed_reason', nullable: true }) removedReason: string | null;
}
