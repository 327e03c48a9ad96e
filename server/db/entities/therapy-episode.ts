import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import type { SurgicalCase } from './surgical-case.js';

/** One lung-expansion therapy episode of a case (shared/registry/therapy.ts). Never hard-deleted: `removed_at`. */
@Entity({ name: 'therapy_episodes' })
@Index(['caseId'])
export class TherapyEpisodeRow {
  @PrimaryGeneratedColumn('uuid') id: string;
  @Column({ type: 'uuid', name: 'case_id' }) caseId: string;
  @ManyToOne('SurgicalCase', { onDelete: 'RESTRICT' }) @JoinColumn({ name: 'case_id' }) surgicalCase: SurgicalCase;
  @Column({ type: 'text' }) modality: string;
  @Column({ type: 'smallint', name: 'start_postoperative_day', nullable: true }) startPostoperativeDay: number | null;
  @Column({ type: 'smallint', name: 'end_postoperative_day', nullable: true }) endPostoperativeDay: number | null;
  @Column({ type: 'smallint', name: 'prescribed_sessions_per_day', nullable: true }) prescribedSessionsPerDay: number | null;
  @Column({ type: 'integer', name: 'sessions_prescribed', nullable: true }) sessionsPrescribed: number | null;
  @Column({ type: 'integer', name: 'sessions_delivered', nullable: true }) sessionsDelivered: number | null;
  @Column({ type: 'text', name: 'delivered_above_prescribed_reason', nullable: true }) deliveredAbovePrescribedReason: string | null;
  @Column({ type: 'numeric', name: 'session_minutes', precision: 6, scale: 1, nullable: true }) sessionMinutes: string | null;
  @Column({ type: 'text', nullable: true }) interface: string | null;
  @Column({ type: 'boolean', name: 'nose_clip', nullable: true }) noseClip: boolean | null;
  @Column({ type: 'boolean', name: 'aerosol_medication', nullable: true }) aerosolMedication: boolean | null;
  @Column({ type: 'text', name: 'source_gas', nullable: true }) sourceGas: string | null;
  @Column({ type: 'numeric', name: 'flow_lpm', precision: 4, scale: 1, nullable: true }) flowLpm: string | null;
  @Column({ type: 'numeric', name: 'expiratory_pressure_cm_h2o', precision: 4, scale: 1, nullable: true }) expiratoryPressureCmH2O: string | null;
  @Column({ type: 'integer', name: 'volume_target_ml', nullable: true }) volumeTargetMl: number | null;
  @Column({ type: 'integer', name: 'inspiratory_capacity_ml', nullable: true }) inspiratoryCapacityMl: number | null;
  @Column({ type: 'integer', name: 'vital_capacity_ml', nullable: true }) vitalCapacityMl: number | null;
  @Column({ type: 'numeric', name: 'predicted_body_weight_kg', precision: 5, scale: 1, nullable: true }) predictedBodyWeightKg: string | null;
  @Column({ type: 'text', nullable: true }) tolerance: string | null;
  @Column({ type: 'text', name: 'adverse_events', array: true, nullable: true }) adverseEvents: string[] | null;
  @Column({ type: 'text', name: 'adverse_event_note', nullable: true }) adverseEventNote: string | null;
  @Column({ type: 'text', name: 'stop_reason', nullable: true }) stopReason: string | null;
  /** Range and indication warnings from checkTherapyEpisode at the last save. */
  @Column({ type: 'jsonb', default: () => "'[]'" }) warnings: unknown[];
  @Column({ type: 'uuid', name: 'created_by', nullable: true }) createdBy: string | null;
  @CreateDateColumn({ type: 'timestamptz', name: 'created_at' }) createdAt: Date;
  @Column({ type: 'timestamptz', name: 'updated_at', default: () => 'now()' }) updatedAt: Date;
  @Column({ type: 'timestamptz', name: 'removed_at', nullable: true }) removedAt: Date | null;
  @Column({ type: 'uuid', name: 'removed_by', nullable: true }) removedBy: string | null;
  @Column({ type: 'text', name: 'removed_reason', nullable: true }) removedReason: string | null;
}
