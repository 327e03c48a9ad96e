import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/**
 * The one append-only audit table: sign-ins, failures, lockouts, case reads, field changes,
 * imports, exports, downloads. The application's role has INSERT and SELECT only, and a
 * trigger refuses UPDATE and DELETE for everyone.
 */
@Entity({ name: 'audit_entries' })
@Index(['entity', 'entityId'])
@Index(['at'])
export class AuditEntry {
  @PrimaryGeneratedColumn({ type: 'bigint' }) id: string;
  @Column({ type: 'timestamptz', default: () => 'now()' }) at: Date;
  @Column({ type: 'uuid', name: 'actor_id', nullable: true }) actorId: string | null;
  @Column({ type: 'text', name: 'actor_email', nullable: true }) actorEmail: string | null;
  @Column({ type: 'text' }) action: string;
  @Column({ type: 'text', nullable: true }) entity: string | null;
  @Column({ type: 'text', name: 'entity_id', nullable: true }) entityId: string | null;
  @Column({ type: 'text', nullable: true }) field: string | null;
  @Column({ type: 'text', name: 'old_value', nullable: true }) oldValue: string | null;
  @Column({ type: 'text', name: 'new_value', nullable: true }) newValue: string | null;
  @Column({ type: 'text', nullable: true }) reason: string | null;
  @Column({ type: 'text', nullable: true }) ip: string | null;
  @Column({ type: 'jsonb', nullable: true }) details: Record<string, unknown> | null;
}
