import { z } from 'zod';

/**
 * The password policy's length rule (OWASP ASVS 4.0.3 V2.1.1: at least 12 characters; V2.1.2:
 * at least 64 allowed). The common-password check runs on the server, which ships the list.
 */
export const PASSWORD_MIN_LENGTH = 12;
export const PASSWORD_MAX_LENGTH = 128;
export const PasswordSchema = z
  .string()
  .min(PASSWORD_MIN_LENGTH, `use at least ${PASSWORD_MIN_LENGTH} characters (a short sentence works well)`)
  .max(PASSWORD_MAX_LENGTH, `use at most ${PASSWORD_MAX_LENGTH} characters`);
