import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/** An action the committee agreed for a measure, with its owner and due date; reminded by e-mail when overdue. */
@Entity({ name: 'committee_actions' })
@Index(['status', 'dueDate'])
export class CommitteeAction {
  @PrimaryGeneratedColumn('uuid') id: string;
  @Column({ type: 'date' }) month: string;
  @Column({ type: 'text', name: 'measure_key' }) measureKey: string;
  @Column({ type: 'text' }) description: string;
  @Column({ type: 'uuid', name: 'owner_id' }) ownerId: string;
  @Column({ type: 'date', name: 'due_date' }) dueDate: string;
  @Column({ type: 'text', default: 'open' }) status: string;
  @Column({ type: 'text', nullable: true }) note: string | null;
  @Column({ type: 'timestamptz', name: 'done_at', nullable: true }) doneAt: Date | null;
  @Column({ type: 'timestamptz', name: 'last_reminded_at', nullable: true }) lastRemindedAt: Date | null;
  @Column({ type: 'uuid', name: 'created_by', nullable: true }) createdBy: string | null;
  @CreateDateColumn({ type: 'timestamptz', name: 'created_at' }) createdAt: Date;
}
