// @vitest-environment node
import { createRequire } from 'node:module';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { componentsUsed, primevueThemeCss, primevueThemeStylesLeftOut, sourceFiles } from './primevue-theme.ts';

const require = createRequire(import.meta.url);
const primevueDir = path.dirname(path.dirname(require.resolve('primevue/config')));
const srcDir = fileURLToPath(new URL('../src', import.meta.url));

describe('the prebuilt PrimeVue theme', () => {
  it('covers the components the app imports and those PrimeVue renders inside them', () => {
    const names = componentsUsed(sourceFiles(srcDir), primevueDir);
    // Imported by the app.
    expect(names).toEqual(expect.arrayContaining(['button', 'dialog', 'datatable', 'select', 'datepicker']));
    // Imported on first use (plugins/overlays.ts, the phone's "More" sheet).
    expect(names).toEqual(expect.arrayContaining(['toast', 'confirmdialog', 'drawer']));
    // Rendered inside those: the table's pager, the select's scroller, the multi-select's chips.
    expect(names).toEqual(expect.arrayContaining(['paginator', 'virtualscroller', 'chip']));
    // Imported only for its types or as a service, no stylesheet of its own.
    expect(names).not.toContain('config');
  });

  it("holds the preset's colours for both schemes, PrimeVue's global rules and each component's style", async () => {
    const css = await primevueThemeCss(['button', 'dialog']);
    expect(css).toMatch(/--p-primary-600:\s*#a4432b/);
    expect(css).toMatch(/:root,:host\{[^}]*--p-primary-color:\s*var\(--p-primary-600\)/);
    expect(css).toMatch(/\.hb-dark\{[^}]*--p-primary-color:\s*var\(--p-primary-400\)/);
    expect(css).toContain('.p-overlay-mask');
    expect(css).toMatch(/\.p-button\s*\{/);
    expect(css).toMatch(/--p-dialog-background:/);
    // Severity buttons moved to the 700 step for contrast on white.
    expect(css).toMatch(/--p-button-danger-background:\s*var\(--p-red-700\)/);
  });
});

describe("the browser bundle's PrimeVue styles", () => {
  it("gets an empty theme string for each component's style import, and leaves every other import alone", async () => {
    const plugin = primevueThemeStylesLeftOut();
    const resolveId = plugin.resolveId as (id: string) => string | undefined;
    const load = plugin.load as (id: string) => string | undefined;
    const stub = resolveId('@primeuix/styles/button');
    expect(stub).toBeDefined();
    expect(resolveId('@primeuix/styles/datatable')).toBe(stub);
    expect(load(stub!)).toBe("export const style = '';");
    expect(resolveId('@primeuix/styled')).toBeUndefined();
    expect(resolveId('primevue/button/style')).toBeUndefined();
    // The stylesheet built in Node still has the component styles the stub leaves out of the bundle.
    expect(await primevueThemeCss(['button'])).toMatch(/\.p-button\s*\{/);
  });
});

