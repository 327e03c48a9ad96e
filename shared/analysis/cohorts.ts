/** Saved cohorts (issue 6): request bodies and the stored record. */
import { z } from 'zod';
import { CohortFilterSchema } from './cohort-filter.js';

const name = z.string({ error: 'enter a name' }).trim().min(1, 'enter a name').max(120, 'at most 120 characters');

export const SavedCohortCreateSchema = z.strictObject({
  name,
  description: z.string().trim().max(500, 'at most 500 characters').nullable().optional(),
  filter: CohortFilterSchema,
  /** Shared with the network's analysts and committee members. */
  shared: z.boolean().default(false),
});
export type SavedCohortCreate = z.infer<typeof SavedCohortCreateSchema>;

export const SavedCohortUpdateSchema = z.strictObject({
  name: name.optional(),
  description: z.string().trim().max(500, 'at most 500 characters').nullable().optional(),
  filter: CohortFilterSchema.optional(),
  shared: z.boolean().optional(),
});
export type SavedCohortUpdate = z.infer<typeof SavedCohortUpdateSchema>;

export const SavedCohortSchema = z.object({
  id: z.uuid(),
  name: z.string(),
  description: z.string().nullable(),
  filter: CohortFilterSchema,
  shared: z.boolean(),
  ownerId: z.uuid(),
  ownerName: z.string(),
  mine: z.boolean(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type SavedCohort = z.infer<typeof SavedCohortSchema>;
export const SavedCohortListSchema = z.object({ items: z.array(SavedCohortSchema) });
