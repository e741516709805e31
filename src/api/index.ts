// Typed calls to the Rigshelf API, grouped by feature.
import type { AdminUserPatch, LoginInput, RegisterInput } from '@shared/schemas/auth';
import type { HealthStatus, PublicUser } from '@shared/types';
import { forgetCsrfToken, http } from './http';

export { ApiError, isApiError } from './http';

export const authApi = {
  async me(): Promise<PublicUser | null> {
    try {
      return (await http.get<{ user: PublicUser }>('/api/auth/me')).user;
    } catch (err) {
      if ((err as { status?: number }).status === 401) return null;
      throw err;
    }
  },
  async login(input: LoginInput): Promise<PublicUser> {
    const { user } = await http.post<{ user: PublicUser }>('/api/auth/login', input);
    forgetCsrfToken();
    return user;
  },
  async register(input: RegisterInput): Promise<PublicUser> {
    const { user } = await http.post<{ user: PublicUser }>('/api/auth/register', input);
    forgetCsrfToken();
    return user;
  },
  async logout(): Promise<void> {
    await http.post<void>('/api/auth/logout');
    forgetCsrfToken();
  },
};

export const adminApi = {
  users: async () => (await http.get<{ users: PublicUser[] }>('/api/admin/users')).users,
  updateUser: async (id: number, patch: AdminUserPatch) =>
    (await http.patch<{ user: PublicUser }>(`/api/admin/users/${id}`, patch)).user,
};

export const healthApi = {
  get: () => http.get<HealthStatus>('/api/health'),
};
