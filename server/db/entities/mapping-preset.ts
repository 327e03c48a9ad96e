import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/** A saved column mapping for a site's recurring exports (header -> registry field per sheet). */
@Entity({ name: 'import_mapping_presets' })
@Index(['siteId', 'name'], { unique: true })
export class MappingPreset {
  @PrimaryGeneratedColumn('uuid') id: string;
  @Column({ type: 'uuid', name: 'site_id' }) siteId: string;
  @Column({ type: 'text' }) name: string;
  @Column({ type: 'jsonb' }) mapping: Record<string, unknown>;
  @Column({ type: 'uuid', name: 'created_by', nullable: true }) createdBy: string | null;
  @CreateDateColumn({ type: 'timestamptz', name: 'created_at' }) createdAt: Date;
  @Column({ type: 'timestamptz', name: 'updated_at', default: () => 'now()' }) updatedAt: Date;
}
