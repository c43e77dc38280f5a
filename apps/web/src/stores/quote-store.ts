import { defineStore } from 'pinia';
import { ref, shallowRef } from 'vue';
import type { CostingSettingsDto, MaterialDto } from '@hodboard/shared';
import { getCostingSettings } from '@/api/costing';
import { listMaterials } from '@/api/materials';

/** What every quote screen prices with: the firm's costing settings and its price list, loaded once and refreshed on save. */
export const useQuoteStore = defineStore('quotes', () => {
  const settings = shallowRef<CostingSettingsDto | null>(null);
  const materials = shallowRef<MaterialDto[]>([]);
  const isLoading = ref(false);
  const error = shallowRef<unknown>(null);
  let loading: Promise<void> | null = null;

  function load(force = false): Promise<void> {
    if (settings.value && !force) return Promise.resolve();
    loading ??= (async () => {
      isLoading.value = true;
      error.value = null;
      try {
        const [loadedSettings, loadedMaterials] = await Promise.all([getCostingSettings(), listMaterials()]);
        settings.value = loadedSettings;
        materials.value = loadedMaterials;
      } catch (caught) {
        error.value = caught;
      } finally {
        isLoading.value = false;
        loading = null;
      }
    })();
    return loading;
  }

  function setSettings(next: CostingSettingsDto): void {
    settings.value = next;
  }

  function setMaterials(next: MaterialDto[]): void {
    materials.value = next;
  }

  return { settings, materials, isLoading, error, load, setSettings, setMaterials };
});
