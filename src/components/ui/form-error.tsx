import { Alert } from './alert';

/** The message of a submission that failed as a whole (wrong password, lost connection…). */
export function FormError({ message }: { message?: string }) {
  if (!message) return null;
  return <Alert tone="error">{message}</Alert>;
}
