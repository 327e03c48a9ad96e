import { Column, CreateDateColumn, Entity, OneToMany, PrimaryGeneratedColumn } from 'typeorm';
import type { Unit } from './unit.js';

@Entity({ name: 'sites' })
export class Site {
  @PrimaryGeneratedColumn('uuid') id: string;
  @Column({ type: 'text', unique: true }) code: string;
  @Column({ type: 'text' }) name: string;
  @Column({ type: 'text', name: 'inclusion_criteria', default: '' }) inclusionCriteria: string;
  @Column({ type: 'text', name: 'exclusion_criteria', default: '' }) exclusionCriteria: string;
  @Column({ type: 'boolean', default: true }) active: boolean;
  @CreateDateColumn({ type: 'timestamptz', name: 'created_at' }) createdAt: Date;
  @OneToMany('Unit', 'site') units: Unit[];
}
