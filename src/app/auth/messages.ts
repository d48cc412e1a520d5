import type { AppError } from '../errors/app-error';

/** Shown for a 401 on sign-in: the same whether the e-mail or the password is wrong. */
export const INVALID_CREDENTIALS_MESSAGE = "That e-mail and password don't match an account.";

/** Shown under the reset-request form, whether or not the address has an account. */
export const RESET_SENT_MESSAGE =
  "If that address has an account, we've sent a link to reset the password.";

/** What the sign-in page says after arriving with `?notice=…`. */
export const SIGN_IN_NOTICES: Readonly<Record<string, string>> = {
  'password-reset': 'Your password has been changed. Sign in with the new one.',
};

/** The 429 message, from the `Retry-After` seconds rounded up to whole minutes. */
export function tooManyAttemptsMessage(retryAfterSeconds: number | null): string {
  if (retryAfterSeconds === null) return 'Too many attempts. Try again in a few minutes.';
  const minutes = Math.max(1, Math.ceil(retryAfterSeconds / 60));
  return `Too many attempts. Try again in ${minutes} ${minutes === 1 ? 'minute' : 'minutes'}.`;
}

/** The message for a failed sign-in that no field shows. */
export function signInFailureMessage(error: AppError): string {
  if (error.status === 401) return INVALID_CREDENTIALS_MESSAGE;
  if (error.status === 429) return tooManyAttemptsMessage(error.retryAfterSeconds);
  return error.message;
}
