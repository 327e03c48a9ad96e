import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn, Unique } from 'typeorm';

/** A random sample of verified cases for blind re-abstraction (the seed reproduces the draw). */
@Entity({ name: 'reabstraction_samples' })
@Index(['createdAt'])
export class ReabstractionSample {
  @PrimaryGeneratedColumn('uuid') id: string;
  /** 32-bit unsigned seed of the PRNG (mulberry32). */
  @Column({ type: 'bigint' }) seed: string;
  @Column({ type: 'integer' }) size: number;
  @Column({ type: 'integer', name: 'pool_size' }) poolSize: number;
  @Column({ type: 'uuid', array: true, name: 'site_ids' }) siteIds: string[];
  @Column({ type: 'text', array: true }) fields: string[];
  @Column({ type: 'uuid', name: 'reabstractor_id' }) reabstractorId: string;
  @Column({ type: 'date', name: 'surgery_from', nullable: true }) surgeryFrom: string | null;
  @Column({ type: 'date', name: 'surgery_to', nullable: true }) surgeryTo: string | null;
  @Column({ type: 'uuid', name: 'created_by', nullable: true }) createdBy: string | null;
  @CreateDateColumn({ type: 'timestamptz', name: 'created_at' }) createdAt: Date;
}

/**
 * One sampled case: the first abstraction's values of the chosen fields as they were when the
 * sample was drawn (never sent to the second abstractor) and the second abstraction's values.
 */
@Entity({ name: 'reabstraction_items' })
@Unique(['sampleId', 'caseId'])
@Index(['caseId'])
export class ReabstractionItem {
  @PrimaryGeneratedColumn('uuid') id: string;
  @Column({ type: 'uuid', name: 'sample_id' }) sampleId: string;
  @Column({ type: 'uuid', name: 'case_id' }) caseId: string;
  @Column({ type: 'integer' }) ordinal: number;
  @Column({ type: 'jsonb', name: 'original_values' }) originalValues: Record<string, unknown>;
  @Column({ type: 'integer', name: 'original_version' }) originalVersion: number;
  @Column({ type: 'jsonb', name: 'entered_values', nullable: true }) enteredValues: Record<string, unknown> | null;
  @Column({ type: 'uuid', name: 'entered_by', nullable: true }) enteredBy: string | null;
  @Column({ type: 'timestamptz', name: 'entered_at', nullable: true }) enteredAt: Date | null;
}

/** The adjudicated value of one disagreement (which abstraction was right, and why). */
@Entity({ name: 'reabstraction_adjudications' })
@Unique(['itemId', 'field'])
export class ReabstractionAdjudication {
  @PrimaryGeneratedColumn('uuid') id: string;
  @Column({ type: 'uuid', name: 'item_id' }) itemId: string;
  @Column({ type: 'text' }) field: string;
  @Column({ type: 'text' }) decision: 'original' | 'reabstracted';
  @Column({ type: 'jsonb', nullable: true }) value: unknown;
  @Column({ type: 'text' }) reason: string;
  /** True when the case was changed (through the registry's audited update). */
  @Column({ type: 'boolean', default: false }) written: boolean;
  @Column({ type: 'uuid', name: 'decided_by', nullable: true }) decidedBy: string | null;
  @CreateDateColumn({ type: 'timestamptz', name: 'decided_at' }) decidedAt: Date;
}
