import type { OutcomeEventCreate, OutcomeEventUpdate } from '../../../../shared/registry/outcome.js';
import type { Case } from '../../../../shared/registry/record.js';
import type { RecordRemove, TherapyEpisodeCreate, TherapyEpisodeUpdate } from '../../../../shared/registry/therapy.js';
import { api, patch, post } from '../../../lib/api-client.js';

/** Therapy episodes and outcome events: each write raises the case version and answers with the case. */
export const createEpisode = (caseId: string, body: TherapyEpisodeCreate) => post<Case>(`/api/cases/${caseId}/therapy`, body);
export const updateEpisode = (caseId: string, episodeId: string, body: TherapyEpisodeUpdate) => patch<Case>(`/api/cases/${caseId}/therapy/${episodeId}`, body);
export const removeEpisode = (caseId: string, episodeId: string, body: RecordRemove) => api<Case>('DELETE', `/api/cases/${caseId}/therapy/${episodeId}`, body);

export const createEvent = (caseId: string, body: OutcomeEventCreate) => post<Case>(`/api/cases/${caseId}/outcomes`, body);
export const updateEvent = (caseId: string, eventId: string, body: OutcomeEventUpdate) => patch<Case>(`/api/cases/${caseId}/outcomes/${eventId}`, body);
export const removeEvent = (caseId: string, eventId: string, body: RecordRemove) => api<Case>('DELETE', `/api/cases/${caseId}/outcomes/${eventId}`, body);
