import { ref, type Ref } from 'vue';
import { listClients } from '@/api/clients';
import { useProblemToast } from './use-problem-toast';

export interface ClientOption {
  value: string;
  label: string;
}

export interface ClientOptions {
  clientOptions: Ref<ClientOption[]>;
  /** The first clients by name, or those matching what was typed into the picker's filter; a failure is toasted. */
  loadClients(query?: string): Promise<void>;
}

/** Client picks for a Select whose filter searches the server, as a firm can have more clients than one page holds. */
export function useClientOptions(): ClientOptions {
  const { showProblem } = useProblemToast();
  const clientOptions = ref<ClientOption[]>([]);

  async function loadClients(query?: string): Promise<void> {
    try {
      const page = await listClients({ pageSize: 50, sort: 'name', q: query || undefined });
      clientOptions.value = page.items.map((client) => ({ value: client.id, label: client.name }));
    } catch (error) {
      showProblem(error);
    }
  }

  return { clientOptions, loadClients };
}
