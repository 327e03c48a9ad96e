import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/** Background work with progress (imports, exports, packets); see server/jobs/. */
@Entity({ name: 'jobs' })
@Index(['status', 'createdAt'])
export class Job {
  @PrimaryGeneratedColumn('uuid') id: string;
  @Column({ type: 'text' }) kind: string;
  @Column({ type: 'text', default: 'queued' }) status: 'queued' | 'running' | 'succeeded' | 'failed' | 'cancelled';
  @Column({ type: 'jsonb', default: () => "'{}'" }) payload: Record<string, unknown>;
  @Column({ type: 'jsonb', default: () => "'{}'" }) progress: Record<string, number | string>;
  @Column({ type: 'jsonb', nullable: true }) result: Record<string, unknown> | null;
  @Column({ type: 'text', nullable: true }) error: string | null;
  @Column({ type: 'integer', default: 0 }) attempts: number;
  @Column({ type: 'boolean', name: 'cancel_requested', default: false }) cancelRequested: boolean;
  @Column({ type: 'uuid', name: 'created_by', nullable: true }) createdBy: string | null;
  @CreateDateColumn({ type: 'timestamptz', name: 'created_at' }) createdAt: Date;
  @Column({ type: 'timestamptz', name: 'started_at', nullable: true }) startedAt: Date | null;
  @Column({ type: 'timestamptz', name: 'finished_at', nullable: true }) finishedAt: Date | null;
  @Column({ type: 'timestamptz', name: 'heartbeat_at', nullable: true }) heartbeatAt: Date | null;
}
