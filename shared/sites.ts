import { z } from 'zod';

export const UnitKindSchema = z.enum(['ward', 'icu', 'theatre-recovery', 'step-down']);
export const UnitSchema = z.object({
  id: z.string().uuid(),
  siteId: z.string().uuid(),
  code: z.string(),
  name: z.string(),
  kind: UnitKindSchema,
  active: z.boolean(),
});
export type Unit = z.infer<typeof UnitSchema>;

export const SiteSchema = z.object({
  id: z.string().uuid(),
  code: z.string(),
  name: z.string(),
  inclusionCriteria: z.string(),
  exclusionCriteria: z.string(),
  active: z.boolean(),
  units: z.array(UnitSchema),
});
export type Site = z.infer<typeof SiteSchema>;

export const SiteWriteSchema = z.object({
  code: z.string().trim().regex(/^[A-Z0-9]{2,8}$/, 'use 2 to 8 capital letters or digits'),
  name: z.string().trim().min(2, 'enter the hospital name').max(120),
  inclusionCriteria: z.string().trim().max(2000).default(''),
  exclusionCriteria: z.string().trim().max(2000).default(''),
  active: z.boolean().default(true),
});
export type SiteWrite = z.infer<typeof SiteWriteSchema>;

export const UnitWriteSchema = z.object({
  code: z.string().trim().regex(/^[A-Z0-9-]{2,12}$/, 'use 2 to 12 capital letters, digits or dashes'),
  name: z.string().trim().min(2).max(120),
  kind: UnitKindSchema,
  active: z.boolean().default(true),
});
export type UnitWrite = z.infer<typeof UnitWriteSchema>;

export const IdParamSchema = z.object({ id: z.string().uuid('the id in the address is not valid') });
