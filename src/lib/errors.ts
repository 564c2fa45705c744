import { isApiError } from './api-client';

/** The sentence to show a person for any thrown value. */
export function describeError(error: unknown): string {
  if (isApiError(error)) return error.message;
  if (error instanceof Error && error.message) return error.message;
  return 'Something went wrong.';
}

/**
 * For React's onCaughtError: an API answer shown by an error boundary (a 404 site, a lost
 * connection) is expected and already on screen; anything else is a bug worth the console.
 */
export function reportCaughtError(error: unknown, info: { componentStack?: string | null }): void {
  if (isApiError(error)) return;
  console.error(error, info.componentStack ?? '');
}
