import { Column, Entity, PrimaryColumn } from 'typeorm';

/** A signal already e-mailed (measure, scope, chart rule, first month of its span), so it is sent once. */
@Entity({ name: 'committee_signal_notices' })
export class CommitteeSignalNotice {
  @PrimaryColumn({ type: 'text', name: 'measure_key' }) measureKey: string;
  /** A site id or 'network'. */
  @PrimaryColumn({ type: 'text' }) scope: string;
  @PrimaryColumn({ type: 'text' }) rule: string;
  @PrimaryColumn({ type: 'text', name: 'start_period' }) startPeriod: string;
  @Column({ type: 'text', name: 'end_period' }) endPeriod: string;
  @Column({ type: 'timestamptz', name: 'notified_at', default: () => 'now()' }) notifiedAt: Date;
}
