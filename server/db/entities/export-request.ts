import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/**
 * A research dataset request (shared/exports/schemas.ts): what was asked, the approver's
 * decision, the k-anonymity result, and the generated file with its expiry. The file itself
 * lives under DATA_DIR/exports and is deleted when it expires (the row stays, as the record).
 */
@Entity({ name: 'export_requests' })
@Index(['requesterId', 'createdAt'])
@Index(['status', 'expiresAt'])
export class ExportRequest {
  @PrimaryGeneratedColumn('uuid') id: string;
  @Column({ type: 'uuid', name: 'requester_id' }) requesterId: string;
  @Column({ type: 'text' }) purpose: string;
  @Column({ type: 'jsonb', default: () => "'{}'" }) cohort: Record<string, unknown>;
  @Column({ type: 'text', default: 'rows' }) kind: string;
  @Column({ type: 'text', array: true, default: () => "'{}'" }) fields: string[];
  @Column({ type: 'text', name: 'rows_by', nullable: true }) rowsBy: string | null;
  @Column({ type: 'text', name: 'cols_by', nullable: true }) colsBy: string | null;
  @Column({ type: 'text' }) format: string;
  @Column({ type: 'text' }) level: string;
  @Column({ type: 'text', name: 'dua_reference', nullable: true }) duaReference: string | null;
  @Column({ type: 'date', name: 'dua_expires_on', nullable: true }) duaExpiresOn: string | null;
  @Column({ type: 'boolean', name: 'site_names_requested', default: false }) siteNamesRequested: boolean;
  @Column({ type: 'text', default: 'pending' }) status: string;
  @Column({ type: 'uuid', name: 'decided_by', nullable: true }) decidedBy: string | null;
  @Column({ type: 'timestamptz', name: 'decided_at', nullable: true }) decidedAt: Date | null;
  @Column({ type: 'text', name: 'decision_reason', nullable: true }) decisionReason: string | null;
  @Column({ type: 'boolean', name: 'site_names_approved', default: false }) siteNamesApproved: boolean;
  @Column({ type: 'text', name: 'risk_action', default: 'none' }) riskAction: string;
  @Column({ type: 'jsonb', nullable: true }) risk: Record<string, unknown> | null;
  @Column({ type: 'uuid', name: 'job_id', nullable: true }) jobId: string | null;
  @Column({ type: 'text', name: 'file_path', nullable: true }) filePath: string | null;
  @Column({ type: 'text', name: 'file_name', nullable: true }) fileName: string | null;
  @Column({ type: 'bigint', name: 'file_bytes', nullable: true }) fileBytes: string | null;
  @Column({ type: 'text', name: 'file_sha256', nullable: true }) fileSha256: string | null;
  @Column({ type: 'integer', name: 'row_count', nullable: true }) rowCount: number | null;
  @Column({ type: 'integer', name: 'sheet_count', nullable: true }) sheetCount: number | null;
  @Column({ type: 'timestamptz', name: 'generated_at', nullable: true }) generatedAt: Date | null;
  @Column({ type: 'timestamptz', name: 'expires_at', nullable: true }) expiresAt: Date | null;
  @Column({ type: 'timestamptz', name: 'deleted_at', nullable: true }) deletedAt: Date | null;
  @CreateDateColumn({ type: 'timestamptz', name: 'created_at' }) createdAt: Date;
}
