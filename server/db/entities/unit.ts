import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import type { Site } from './site.js';

@Entity({ name: 'units' })
@Index(['siteId', 'code'], { unique: true })
export class Unit {
  @PrimaryGeneratedColumn('uuid') id: string;
  @Column({ type: 'uuid', name: 'site_id' }) siteId: string;
  @ManyToOne('Site', 'units', { onDelete: 'RESTRICT' }) @JoinColumn({ name: 'site_id' }) site: Site;
  @Column({ type: 'text' }) code: string;
  @Column({ type: 'text' }) name: string;
  @Column({ type: 'text', default: 'ward' }) kind: string;
  @Column({ type: 'boolean', default: true }) active: boolean;
}
