// The password policy, one for the server and the client forms: 10 to 200 characters, and not easy
// to guess as judged by zxcvbn (dictionaries of common passwords, names and words; repeats,
// sequences, keyboard patterns, dates). The estimator and its dictionaries are loaded on first use,
// so the client downloads them only when a password form is checked.
import { z } from 'zod';

export const PASSWORD_MIN_LENGTH = 10;
/** zxcvbn's scale runs 0..4; 3 means "safely unguessable" for an online attack and reasonable
 * against a slow-hash offline one. */
export const PASSWORD_MIN_SCORE = 3;

type Estimator = { check(password: string, userInputs?: string[]): { score: number; feedback: { warning: string | null; suggestions: string[] } } };

let estimator: Promise<Estimator> | undefined;

function loadEstimator(): Promise<Estimator> {
  estimator ??= Promise.all([import('@zxcvbn-ts/core'), import('@zxcvbn-ts/language-common'), import('@zxcvbn-ts/language-en')]).then(
    ([core, common, en]) =>
      new core.ZxcvbnFactory({
        dictionary: { ...common.dictionary, ...en.dictionary },
        graphs: common.adjacencyGraphs,
        translations: en.translations,
      }),
  );
  return estimator;
}

/** Why the password is too easy to guess, or null when it is strong enough. `related` holds what the
 * password must not lean on (the user's name and e-mail, the product's name). */
export async function passwordWeakness(password: string, related: string[] = []): Promise<string | null> {
  const words = [...related, 'phaselot'].flatMap((text) => text.toLowerCase().split(/[^\p{L}\p{N}]+/u)).filter((word) => word.length >= 3);
  const { score, feedback } = (await loadEstimator()).check(password, words);
  if (score >= PASSWORD_MIN_SCORE) return null;
  const advice = [feedback.warning, ...feedback.suggestions].filter(Boolean).join(' ');
  return `This password is too easy to guess. ${advice || 'Use a few unrelated words or a longer mix of characters.'}`;
}

/** What a password form tells before anything is typed. */
export const PASSWORD_HINT = `At least ${PASSWORD_MIN_LENGTH} characters and not easy to guess: a few unrelated words work well.`;

/** Length only, for objects that check the strength together with related fields. */
export const passwordLengthSchema = z.string().min(PASSWORD_MIN_LENGTH, `At least ${PASSWORD_MIN_LENGTH} characters`).max(200, 'At most 200 characters');

/** A new password, length and strength (the schema is asynchronous: parse it with parseAsync). */
export const newPasswordSchema = passwordLengthSchema.superRefine(async (password, ctx) => {
  const weakness = await passwordWeakness(password);
  if (weakness) ctx.addIssue({ code: 'custom', message: weakness });
});

/** Adds the strength check of `field` to an object schema, against the object's `related` fields. */
export function checkPasswordStrength<T extends Record<string, unknown>>(field: keyof T & string, related: (keyof T & string)[]) {
  return async (value: T, ctx: z.RefinementCtx) => {
    const password = value[field];
    if (typeof password !== 'string') return;
    const relatedTexts = related.map((key): unknown => value[key]).filter((text): text is string => typeof text === 'string');
    const weakness = await passwordWeakness(password, relatedTexts);
    if (weakness) ctx.addIssue({ code: 'custom', path: [field], message: weakness });
  };
}
