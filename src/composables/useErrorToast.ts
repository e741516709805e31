import { useToast } from 'primevue/usetoast';
import { isApiError } from '@/api';

/** Shows an API (or unexpected) error as a toast a person can act on. */
export function useErrorToast() {
  const toast = useToast();
  return (err: unknown, summary = 'That did not work') => {
    const detail = isApiError(err) ? err.message : 'Unexpected error. Reload the page and try again.';
    toast.add({ severity: 'error', summary, detail, life: 6000 });
  };
}
