import { defineStore } from 'pinia';
import { computed, ref } from 'vue';
import type { LoginInput, RegisterInput } from '@shared/schemas/auth';
import type { PublicUser, Role } from '@shared/types';
import { authApi } from '@/api';
import { useOfflineStore } from '@/stores/offline';

const rank: Record<Role, number> = { member: 0, moderator: 1, admin: 2 };

export const useAuthStore = defineStore('auth', () => {
  const user = ref<PublicUser | null>(null);
  const loaded = ref(false);
  let loading: Promise<void> | null = null;

  const signedIn = computed(() => user.value !== null);

  function hasRole(role: Role): boolean {
    return user.value !== null && rank[user.value.role] >= rank[role];
  }

  function ensureLoaded(): Promise<void> {
    if (loaded.value) return Promise.resolve();
    loading ??= authApi
      .me()
      .then((u) => {
        user.value = u;
      })
      .catch(() => {
        user.value = null;
      })
      .finally(() => {
        loaded.value = true;
        loading = null;
      });
    return loading;
  }

  async function login(input: LoginInput) {
    user.value = await authApi.login(input);
    const offline = useOfflineStore();
    await offline.forgetCopies();
    // entries this member wrote offline before their session ran out go now
    void offline.flush();
  }

  /** Resolves with the server's "check your mail" message; the new member signs in after confirming. */
  async function register(input: RegisterInput): Promise<string> {
    return authApi.register(input);
  }

  async function logout() {
    await authApi.logout();
    user.value = null;
    // the member's kits and parts kept for no signal leave the device with them; entries they wrote
    // offline and not yet sent stay, and go with their session when they sign in again
    await useOfflineStore().forgetCopies();
  }

  return { user, loaded, signedIn, hasRole, ensureLoaded, login, register, logout };
});
