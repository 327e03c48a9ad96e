import { Column, Entity, PrimaryColumn } from 'typeorm';

@Entity({ name: 'settings' })
export class Setting {
  @PrimaryColumn({ type: 'text' }) key: string;
  @Column({ type: 'jsonb' }) value: unknown;
}
