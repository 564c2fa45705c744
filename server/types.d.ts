import 'express-session';
import type { SiteRole } from '@shared/schemas/common';

declare global {
  namespace Express {
    interface User {
      id: string;
      email: string;
      name: string;
      isAdmin: boolean;
      disabled: boolean;
    }
    interface Request {
      /** Set by the site policy: the site the route acts on and the caller's role there (null for an Admin who is not a member). */
      siteAccess?: { siteId: string; role: SiteRole | null };
    }
  }
}

declare module 'express-session' {
  interface SessionData {
    csrfToken?: string;
    /** When the signed-in session began, for the absolute lifetime. */
    signedInAtMs?: number;
  }
}
