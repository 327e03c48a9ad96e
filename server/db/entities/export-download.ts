import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/** One download of an export file (the audit log has it too; this row counts them per request). */
@Entity({ name: 'export_downloads' })
@Index(['requestId'])
export class ExportDownload {
  @PrimaryGeneratedColumn('uuid') id: string;
  @Column({ type: 'uuid', name: 'request_id' }) requestId: string;
  @Column({ type: 'uuid', name: 'user_id' }) userId: string;
  @Column({ type: 'timestamptz', name: 'at', default: () => 'now()' }) at: Date;
  @Column({ type: 'text', nullable: true }) ip: string | null;
}
