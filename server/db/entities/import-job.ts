import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/**
 * One bulk import (server/imports/): the uploaded file's name, hash and temporary path, the
 * column mapping, dry-run counts and problems (never identifier values), the commit outcome.
 * No cell values of unmapped columns and no identifier is ever stored here.
 */
@Entity({ name: 'import_jobs' })
@Index(['siteId', 'createdAt'])
@Index(['fileHash'])
export class ImportJob {
  @PrimaryGeneratedColumn('uuid') id: string;
  @Column({ type: 'uuid', name: 'site_id' }) siteId: string;
  @Column({ type: 'uuid', name: 'created_by', nullable: true }) createdBy: string | null;
  @Column({ type: 'text', name: 'file_name' }) fileName: string;
  @Column({ type: 'text', name: 'file_hash' }) fileHash: string;
  @Column({ type: 'bigint', name: 'file_size' }) fileSize: string;
  @Column({ type: 'text', name: 'file_type' }) fileType: 'csv' | 'xlsx';
  /** Path of the uploaded file under DATA_DIR while it is kept; null once deleted. */
  @Column({ type: 'text', name: 'stored_path', nullable: true }) storedPath: string | null;
  @Column({ type: 'text', default: 'point' }) decimal: 'point' | 'comma';
  @Column({ type: 'text', name: 'default_kind', default: 'cases' }) defaultKind: string;
  @Column({ type: 'text', default: 'uploaded' }) status: string;
  /** Sheets found: kind, sheet name, header texts, row count, proposed mapping. */
  @Column({ type: 'jsonb', default: () => "'[]'" }) sheets: unknown[];
  @Column({ type: 'jsonb', nullable: true }) mapping: Record<string, unknown> | null;
  @Column({ type: 'jsonb', nullable: true }) counts: Record<string, unknown> | null;
  @Column({ type: 'jsonb', default: () => "'[]'" }) problems: unknown[];
  @Column({ type: 'integer', name: 'problem_count', default: 0 }) problemCount: number;
  @Column({ type: 'text', nullable: true }) policy: string | null;
  @Column({ type: 'uuid', name: 'dry_run_job_id', nullable: true }) dryRunJobId: string | null;
  @Column({ type: 'uuid', name: 'commit_job_id', nullable: true }) commitJobId: string | null;
  @Column({ type: 'text', nullable: true }) error: string | null;
  @CreateDateColumn({ type: 'timestamptz', name: 'created_at' }) createdAt: Date;
  @Column({ type: 'timestamptz', name: 'validated_at', nullable: true }) validatedAt: Date | null;
  @Column({ type: 'timestamptz', name: 'committed_at', nullable: true }) committedAt: Date | null;
  @Column({ type: 'timestamptz', name: 'abandoned_at', nullable: true }) abandonedAt: Date | null;
  @Column({ type: 'timestamptz', name: 'file_deleted_at', nullable: true }) fileDeletedAt: Date | null;
}
