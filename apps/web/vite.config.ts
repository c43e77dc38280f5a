import { fileURLToPath, URL } from 'node:url';
import { defineConfig, type Plugin } from 'vite';
import vue from '@vitejs/plugin-vue';
import { VitePWA } from 'vite-plugin-pwa';
import { crewPwa } from './pwa.config.ts';
import { prebuiltPrimeVueTheme, primevueThemeStylesLeftOut } from './vite/primevue-theme.ts';
import { primeiconsSubset } from './vite/primeicons-subset.ts';

const apiTarget = 'http://127.0.0.1:3000';

/**
 * The page's first script (src/boot/start.ts) imports the app only once the shell has painted, so the app's code is
 * a dynamic import the HTML knows nothing of. This lists that code and its stylesheets in the page's head as
 * preloads, so the download starts with the page, as it would for an ordinary entry script, and only the
 * evaluation waits.
 */
function preloadAppAfterShell(): Plugin {
  return {
    name: 'hodboard:preload-app-after-shell',
    apply: 'build',
    transformIndexHtml: {
      order: 'post',
      handler(html, { bundle }) {
        if (!bundle) return html;
        const chunks = Object.values(bundle).filter((output) => output.type === 'chunk');
        const app = chunks.find((chunk) => chunk.facadeModuleId?.endsWith('/src/main.ts'));
        if (!app) throw new Error('no chunk for src/main.ts in the build: the page would preload nothing');
        // The first script runs the framework and the component library a turn ahead of the app (src/boot/start.ts).
        const turns = chunks.filter((chunk) => chunk.moduleIds.some((id) => /\/src\/boot\/(framework|component-library)\.ts$/.test(id)));
        const scripts = new Set<string>();
        const styles = new Set<string>();
        const visit = (fileName: string) => {
          if (scripts.has(fileName)) return;
          scripts.add(fileName);
          const chunk = bundle[fileName];
          if (chunk?.type !== 'chunk') return;
          for (const css of chunk.viteMetadata?.importedCss ?? []) styles.add(css);
          for (const imported of chunk.imports) visit(imported);
        };
        for (const turn of turns) visit(turn.fileName);
        visit(app.fileName);
        // The page's first script has its own script tag, at the priority a script tag gets.
        for (const chunk of chunks) if (chunk.isEntry) scripts.delete(chunk.fileName);
        const base = '/';
        // fetchpriority="low": the shell paints without any of these, so none of them should hold the first paint up,
        // or be taken as holding it up (Lighthouse counts a high-priority script that lands before the first paint
        // as one the paint waited for, which made its first-paint figure swing between runs of one build).
        const attrs = { crossorigin: true, fetchpriority: 'low' };
        return [
          // crossorigin as on Vite's own stylesheet link for a dynamic import: a preload in another credentials
          // mode is not reused, and the stylesheet would download twice.
          ...[...styles].map((file) => ({ tag: 'link', attrs: { rel: 'preload', as: 'style', ...attrs, href: `${base}${file}` }, injectTo: 'head' as const })),
          ...[...scripts].map((file) => ({ tag: 'link', attrs: { rel: 'modulepreload', ...attrs, href: `${base}${file}` }, injectTo: 'head' as const })),
        ];
      },
    },
  };
}

export default defineConfig({
  plugins: [vue(), VitePWA(crewPwa), primevueThemeStylesLeftOut(), prebuiltPrimeVueTheme(fileURLToPath(new URL('./src', import.meta.url))), primeiconsSubset(fileURLToPath(new URL('./src', import.meta.url))), preloadAppAfterShell()],
  resolve: {
    alias: [
      { find: '@', replacement: fileURLToPath(new URL('./src', import.meta.url)) },
      // Shared code imports rrule the way Node's ESM loader needs (a default import of its CJS build);
      // the browser bundle must see that same build, as rrule's ESM entry has no default export.
      { find: /^rrule$/, replacement: 'rrule/dist/es5/rrule.js' },
    ],
  },
  server: {
    proxy: {
      '/api': { target: apiTarget, changeOrigin: false },
      '/socket.io': { target: apiTarget, ws: true },
    },
  },
  build: {
    target: 'es2022',
    rolldownOptions: {
      // Shared code is pure by design; saying so lets the bundle drop the trade-rule libraries
      // (holiday tables, recurrence, sun position) from pages that never call them.
      treeshake: {
        moduleSideEffects: (id: string) => !/[\\/]packages[\\/]shared[\\/]src[\\/]/.test(id),
      },
      output: {
        // Vendor code changes far less often than views; separate chunks keep browser caches warm across releases.
        codeSplitting: {
          groups: [
            // With them the modules the page's first script imports to run them a turn ahead of the app (src/boot/start.ts).
            { name: 'vue-vendor', test: /node_modules[\\/](vue|@vue|vue-router|pinia)[\\/]|[\\/]src[\\/]boot[\\/]framework\.ts$/ },
            // With PrimeVue's core, the small components most screens show, rather than a chunk each: on a slow signal every
            // extra file of a first screen costs a round trip. Not its dialogs or icons: the first screens show neither, and
            // they travel with the components that draw them.
            {
              name: 'primevue-core',
              test: /node_modules[\\/](@primeuix|@primevue[\\/]core|primevue[\\/](button|message|skeleton|tag|textarea|inputtext|useconfirm|usetoast|overlayeventbus|portal|progressbar|badge))[\\/]|[\\/]src[\\/]boot[\\/]component-library\.ts$/,
            },
            // The payload schemas travel with zod, apart from the words screens show (shared/src/terms), so a screen
            // with no form to check (the crew's phone, at first) loads neither.
            { name: 'schemas', test: /node_modules[\\/]zod[\\/]|[\\/]packages[\\/]shared[\\/]src[\\/]schemas[\\/]/ },
            // The app's small modules of data, offline and formatting helpers, one file instead of one each; only these,
            // not what they import: the page's first script shares src/boot/early-refresh.ts with the http client, and
            // must not wait for this file to send the early renewal.
            {
              name: 'app-common',
              test: /[\\/]apps[\\/]web[\\/]src[\\/](api|offline|utils)[\\/]|node_modules[\\/]idb[\\/]/,
              includeDependenciesRecursively: false,
            },
            // Ahead of the schemas group, which would otherwise take these in with the schemas that import them; with
            // them the unit conversions and rounding screens show values in (the board's weather reasons use them).
            { name: 'terms', test: /[\\/]packages[\\/]shared[\\/]src[\\/](terms[\\/]|rules[\\/]units\.ts$)/, priority: 1 },
          ],
        },
      },
    },
  },
});
