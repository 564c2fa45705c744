import type { SiteRole } from '@shared/schemas/common';

export const ROLE_DESCRIPTIONS: Record<SiteRole, string> = {
  Lead: 'manages the site, its members and viewer links',
  Analyst: 'enters wells and records, fits tests and submits them for checking',
  Checker: 'checks fits, returns them with a comment or signs them off',
  Viewer: 'reads the site and its K map',
};
