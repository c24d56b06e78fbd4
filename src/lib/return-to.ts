/** Only same-site paths are followed after sign-in, so a crafted link cannot send someone elsewhere. */
export function safeReturnTo(value: string | null | undefined): string | null {
  if (!value || !value.startsWith('/') || value.startsWith('//') || value.startsWith('/\\')) return null;
  if (value.startsWith('/sign-in') || value.startsWith('/sign-up')) return null;
  return value;
}

export function signInPath(returnTo: string): string {
  return `/sign-in?returnTo=${encodeURIComponent(returnTo)}`;
}
