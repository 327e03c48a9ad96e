import { csrfSync } from 'csrf-sync';

/**
 * CSRF protection for every state-changing request: the synchronizer-token pattern (OWASP CSRF
 * cheat sheet) with the token kept in the server-side session and sent in the X-CSRF-Token header.
 */
export const { csrfSynchronisedProtection, generateToken } = csrfSync({
  getTokenFromRequest: (req) => req.headers['x-csrf-token'] as string | undefined,
});
