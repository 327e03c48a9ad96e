import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { TheatreListUpload } from '../../../../shared/quality/capture.js';
import { api } from '../../../lib/api-client.js';

/** POST the theatre list as multipart form data (the identifiers are hashed by the server). */
export const uploadTheatreList = (siteId: string, file: File) => {
  const form = new FormData();
  form.append('siteId', siteId);
  form.append('file', file);
  return api<TheatreListUpload>('POST', '/api/quality/capture/theatre-lists', form);
};
export function useUploadTheatreList() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: (v: { siteId: string; file: File }) => uploadTheatreList(v.siteId, v.file), onSuccess: () => qc.invalidateQueries({ queryKey: ['quality', 'capture'] }) });
}
