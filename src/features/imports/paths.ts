/** This feature's URLs (kept here so the shared paths module stays untouched). */
export const importPaths = {
  start: '/imports',
  history: '/imports/history',
  detail: (id: string) => `/imports/${id}`,
};
