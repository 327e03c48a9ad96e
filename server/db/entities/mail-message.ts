import { Column, CreateDateColumn, Entity, PrimaryGeneratedColumn } from 'typeorm';

/** What the local SMTP stand-in received (demo and tests only). */
@Entity({ name: 'mail_messages' })
export class MailMessage {
  @PrimaryGeneratedColumn('uuid') id: string;
  @CreateDateColumn({ type: 'timestamptz', name: 'received_at' }) receivedAt: Date;
  @Column({ type: 'text', name: 'mail_from' }) from: string;
  @Column({ type: 'text', array: true, name: 'mail_to' }) to: string[];
  @Column({ type: 'text' }) subject: string;
  @Column({ type: 'text' }) body: string;
}
