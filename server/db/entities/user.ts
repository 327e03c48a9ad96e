import { Column, CreateDateColumn, Entity, PrimaryGeneratedColumn } from 'typeorm';

@Entity({ name: 'users' })
export class User {
  @PrimaryGeneratedColumn('uuid') id: string;
  @Column({ type: 'text', unique: true }) email: string;
  @Column({ type: 'text', name: 'display_name' }) displayName: string;
  @Column({ type: 'text', name: 'password_hash', nullable: true }) passwordHash: string | null;
  @Column({ type: 'text', array: true, default: () => "'{}'" }) roles: string[];
  @Column({ type: 'boolean', name: 'is_chair', default: false }) isChair: boolean;
  @Column({ type: 'boolean', default: true }) active: boolean;
  @Column({ type: 'text', name: 'totp_secret', nullable: true }) totpSecret: string | null;
  @Column({ type: 'boolean', name: 'totp_enabled', default: false }) totpEnabled: boolean;
  @Column({ type: 'integer', name: 'failed_attempts', default: 0 }) failedAttempts: number;
  @Column({ type: 'timestamptz', name: 'locked_until', nullable: true }) lockedUntil: Date | null;
  @Column({ type: 'timestamptz', name: 'last_login_at', nullable: true }) lastLoginAt: Date | null;
  @CreateDateColumn({ type: 'timestamptz', name: 'created_at' }) createdAt: Date;
}
