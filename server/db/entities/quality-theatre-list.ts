import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/** One upload of a site's theatre list (its eligible operations); the file itself is not kept. */
@Entity({ name: 'theatre_list_uploads' })
@Index(['siteId', 'createdAt'])
export class TheatreListUpload {
  @PrimaryGeneratedColumn('uuid') id: string;
  @Column({ type: 'uuid', name: 'site_id' }) siteId: string;
  @Column({ type: 'uuid', name: 'created_by', nullable: true }) createdBy: string | null;
  @Column({ type: 'text', name: 'file_hash' }) fileHash: string;
  @Column({ type: 'integer' }) rows: number;
  @Column({ type: 'date', name: 'from_date', nullable: true }) fromDate: string | null;
  @Column({ type: 'date', name: 'to_date', nullable: true }) toDate: string | null;
  /** Entries of earlier uploads on the same dates that this upload replaced. */
  @Column({ type: 'integer', default: 0 }) replaced: number;
  @CreateDateColumn({ type: 'timestamptz', name: 'created_at' }) createdAt: Date;
}

/**
 * One eligible operation of a theatre list: date, site, procedure category and the keyed hash
 * of the hospital's identifier (server/registry/identifier-hash.ts). No identifier is stored.
 */
@Entity({ name: 'theatre_list_entries' })
@Index(['siteId', 'operationDate'])
@Index(['uploadId'])
export class TheatreListEntry {
  @PrimaryGeneratedColumn('uuid') id: string;
  @Column({ type: 'uuid', name: 'upload_id' }) uploadId: string;
  @Column({ type: 'uuid', name: 'site_id' }) siteId: string;
  @Column({ type: 'date', name: 'operation_date' }) operationDate: string;
  @Column({ type: 'text', name: 'procedure_category' }) procedureCategory: string;
  @Column({ type: 'text', name: 'identifier_hash' }) identifierHash: string;
}
