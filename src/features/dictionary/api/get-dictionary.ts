import { queryOptions, useQuery } from '@tanstack/react-query';
import type { DictionaryEntry } from '../../../../shared/registry/dictionary.js';
import { get } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

export interface DictionaryResponse { items: DictionaryEntry[]; columns: string[]; freeTextReminder: string }

export const dictionaryQueryOptions = queryOptions({ queryKey: queryKeys.dictionary.all, queryFn: () => get<DictionaryResponse>('/api/dictionary'), staleTime: 60 * 60_000 });
export const useDictionary = () => useQuery(dictionaryQueryOptions);

/** Download addresses (the server sets the file name and records the download). */
export const dictionaryDownload = (format: 'csv' | 'xlsx') => `/api/dictionary?format=${format}`;
