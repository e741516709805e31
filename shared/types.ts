// Types that cross the wire, used by the server and the client alike.
export const ROLES = ['member', 'moderator', 'admin'] as const;
export type Role = (typeof ROLES)[number];

export const ACCOUNT_STATUSES = ['active', 'suspended'] as const;
export type AccountStatus = (typeof ACCOUNT_STATUSES)[number];

export interface PublicUser {
  id: number;
  email: string;
  displayName: string;
  role: Role;
  status: AccountStatus;
  crewRole: string | null;
  createdAt: string;
}

/** Every error the API returns has this body. */
export interface ApiErrorBody {
  error: {
    code: string;
    message: string;
    fields?: Record<string, string>;
  };
}

export interface HealthStatus {
  status: 'ok' | 'degraded';
  db: 'up' | 'down';
}
