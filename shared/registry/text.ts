/**
 * Free text in the registry: short, and never a place for identifiers. The reminder is shown
 * beside every free-text input; the server also refuses text that looks like an e-mail
 * address, a telephone number or a record number, so that a slip cannot store one.
 */
import { z } from 'zod';

export const FREE_TEXT_REMINDER =
  'Do not enter names, record numbers, dates of birth, addresses or any other identifier in free text.';

const EMAIL = /[^\s@]+@[^\s@]+\.[^\s@]+/;
/** Six or more digits in a row (allowing spaces, dots or dashes between them): record and phone numbers. */
const LONG_NUMBER = /\d(?:[\s.\-/]?\d){5,}/;

/** Why a text looks like it carries an identifier, or null. */
export function identifierLikeContent(text: string): string | null {
  if (EMAIL.test(text)) return 'looks like it contains an e-mail address';
  if (LONG_NUMBER.test(text)) return 'contains a long number (a record or telephone number?)';
  return null;
}

/** A trimmed free-text field of at most `max` characters that refuses identifier-like content. */
export function freeText(max: number) {
  return z
    .string({ error: 'enter text' })
    .trim()
    .max(max, `keep it under ${max} characters`)
    .superRefine((v, ctx) => {
      const why = identifierLikeContent(v);
      if (why) ctx.addIssue({ code: 'custom', message: `${why}; remove it. ${FREE_TEXT_REMINDER}` });
    });
}

/** A required reason (withdrawal, amendment, removal): 5 to 300 characters, no identifiers. */
export const ReasonSchema = freeText(300).refine((v) => v.length >= 5, 'give the reason in a few words (at least 5 characters)');
