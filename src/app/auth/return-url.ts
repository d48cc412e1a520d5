/**
 * The in-app path to go to after sign-in, or `/`. Only same-origin paths are accepted, so a
 * crafted link cannot send someone elsewhere after they sign in.
 */
export function safeReturnUrl(value: string | null | undefined): string {
  if (!value || !value.startsWith('/') || value.startsWith('//') || value.startsWith('/\\')) {
    return '/';
  }
  return value.startsWith('/sign-in') ? '/' : value;
}
