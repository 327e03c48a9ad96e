import { Entity, JoinColumn, ManyToOne, PrimaryColumn } from 'typeorm';
import type { User } from './user.js';
import type { Site } from './site.js';

@Entity({ name: 'user_sites' })
export class UserSite {
  @PrimaryColumn({ type: 'uuid', name: 'user_id' }) userId: string;
  @PrimaryColumn({ type: 'uuid', name: 'site_id' }) siteId: string;
  @ManyToOne('User', { onDelete: 'CASCADE' }) @JoinColumn({ name: 'user_id' }) user: User;
  @ManyToOne('Site', { onDelete: 'CASCADE' }) @JoinColumn({ name: 'site_id' }) site: Site;
}
