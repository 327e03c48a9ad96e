import { Column, CreateDateColumn, Entity, PrimaryColumn } from 'typeorm';

/** The committee's review of one month: findings and actions hang from it; the chair signs it off. */
@Entity({ name: 'committee_reviews' })
export class CommitteeReview {
  @PrimaryColumn({ type: 'date' }) month: string;
  @Column({ type: 'uuid', name: 'signed_by', nullable: true }) signedBy: string | null;
  @Column({ type: 'timestamptz', name: 'signed_at', nullable: true }) signedAt: Date | null;
  @CreateDateColumn({ type: 'timestamptz', name: 'created_at' }) createdAt: Date;
}
