import { useEffect } from 'react';

/** Each screen names itself in the tab and for screen readers' page announcements. */
export function useDocumentTitle(title: string): void {
  useEffect(() => {
    document.title = title ? `${title} · Kfield` : 'Kfield';
  }, [title]);
}
