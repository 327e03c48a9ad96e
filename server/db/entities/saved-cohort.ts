import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/**
 * A saved, named cohort (issue 6): a CohortFilter (shared/analysis/cohort-filter.ts, checked on
 * every write and read) with its owner; shared cohorts are visible to the network's analysts and
 * committee members. Holds no case data.
 */
@Entity({ name: 'saved_cohorts' })
@Index(['ownerId', 'name'], { unique: true })
@Index(['shared'])
export class SavedCohort {
  @PrimaryGeneratedColumn('uuid') id: string;
  @Column({ type: 'text' }) name: string;
  @Column({ type: 'text', nullable: true }) description: string | null;
  @Column({ type: 'jsonb' }) filter: Record<string, unknown>;
  @Column({ type: 'uuid', name: 'owner_id' }) ownerId: string;
  @Column({ type: 'boolean', default: false }) shared: boolean;
  @CreateDateColumn({ type: 'timestamptz', name: 'created_at' }) createdAt: Date;
  @Column({ type: 'timestamptz', name: 'updated_at', default: () => 'now()' }) updatedAt: Date;
}
