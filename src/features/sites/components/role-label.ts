import type { Site } from '@shared/schemas/sites';

/** What to call the viewer's relation to a site: their role, or Admin access without membership. */
export function myRoleLabel(site: Site): string {
  return site.myRole ?? 'Admin access';
}
