import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/** A note pinned to a month of a site (or of the network when site_id is null), shown on every chart of it. */
@Entity({ name: 'committee_annotations' })
@Index(['siteId', 'month'])
export class CommitteeAnnotation {
  @PrimaryGeneratedColumn('uuid') id: string;
  @Column({ type: 'uuid', name: 'site_id', nullable: true }) siteId: string | null;
  /** First day of the month. */
  @Column({ type: 'date' }) month: string;
  @Column({ type: 'text' }) text: string;
  @Column({ type: 'uuid', name: 'created_by', nullable: true }) createdBy: string | null;
  @CreateDateColumn({ type: 'timestamptz', name: 'created_at' }) createdAt: Date;
  @Column({ type: 'timestamptz', name: 'removed_at', nullable: true }) removedAt: Date | null;
}
