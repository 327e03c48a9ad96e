import { z } from 'zod';

/** List query shared by every paginated route: `page`, `pageSize`, `sort=field.asc|desc`. */
export const PageQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(500).default(50),
  sort: z
    .string()
    .regex(/^[A-Za-z][A-Za-z0-9_]*\.(asc|desc)$/, 'sort must look like field.asc or field.desc')
    .optional(),
});
export type PageQuery = z.infer<typeof PageQuerySchema>;

export function pageSchema<T extends z.ZodType>(item: T) {
  return z.object({
    items: z.array(item),
    total: z.number().int(),
    totalIsEstimate: z.boolean().optional(),
    page: z.number().int(),
    pageSize: z.number().int(),
  });
}
export type Page<T> = { items: T[]; total: number; totalIsEstimate?: boolean; page: number; pageSize: number };

export function parseSort(sort: string | undefined): { field: string; direction: 'ASC' | 'DESC' } | null {
  if (!sort) return null;
  const [field, dir] = sort.split('.');
  return { field, direction: dir === 'desc' ? 'DESC' : 'ASC' };
}
