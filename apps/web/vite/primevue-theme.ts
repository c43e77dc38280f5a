import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';
import type { Plugin } from 'vite';
import { HodboardPreset, themeOptions } from '../src/plugins/primevue-preset.ts';

const MODULE_ID = 'virtual:primevue-theme.css';
const RESOLVED_ID = `\0${MODULE_ID}`;
// Static imports and import() calls alike: a component loaded on first use needs its styles as much as any other.
const PRIMEVUE_IMPORT = /(?:from\s+|import\(\s*)['"]primevue\/([a-z]+)['"]/g;

export function sourceFiles(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
    const file = path.join(dir, entry.name);
    if (entry.isDirectory()) return sourceFiles(file);
    return /\.(vue|ts)$/.test(entry.name) && !entry.name.endsWith('.test.ts') ? [file] : [];
  });
}

/** The PrimeVue components the app can show: those its code imports, and those they import in turn. */
export function componentsUsed(files: string[], primevueDir: string): string[] {
  const seen = new Set<string>();
  const styled: string[] = [];
  const visit = (name: string): void => {
    if (seen.has(name)) return;
    seen.add(name);
    if (existsSync(path.join(primevueDir, name, 'style', 'index.mjs'))) styled.push(name);
    const entry = path.join(primevueDir, name, 'index.mjs');
    if (!existsSync(entry)) return;
    for (const match of readFileSync(entry, 'utf8').matchAll(PRIMEVUE_IMPORT)) visit(match[1]!);
  };
  for (const file of files) for (const match of readFileSync(file, 'utf8').matchAll(PRIMEVUE_IMPORT)) visit(match[1]!);
  return styled.sort();
}

interface CommonTheme {
  primitive?: { css?: string };
  semantic?: { css?: string };
  global?: { css?: string };
  style?: unknown;
}

/** What this file uses of @primevue/core/base/style, whose published types leave these out. */
interface BaseStyleApi {
  style?: unknown;
  getCommonTheme(): CommonTheme | undefined;
}

interface ComponentStyle {
  name: string;
  style?: unknown;
  getComponentTheme(): { css?: string; style?: unknown } | undefined;
  getDirectiveTheme(): { css?: string; style?: unknown } | undefined;
}

/**
 * The preset as one stylesheet: PrimeVue's variables, its global style and each used component's variables and style,
 * made by the same calls, in the same order, as PrimeVue's components make them in the browser when they first show
 * (BaseComponent's _loadThemeStyles), so the result is the same CSS. The app installs PrimeVue with `theme: 'none'`
 * and imports `virtual:primevue-theme.css` instead of having every phone build it.
 */
export async function primevueThemeCss(componentNames: string[]): Promise<string> {
  const { Theme, css } = await import('@primeuix/styled');
  const BaseStyle = (await import('@primevue/core/base/style')).default as unknown as BaseStyleApi;
  Theme.setTheme({ preset: HodboardPreset, options: themeOptions });
  const common = BaseStyle.getCommonTheme() ?? {};
  const sheets: Array<string | undefined> = [
    common.primitive?.css,
    common.semantic?.css,
    common.global?.css,
    Theme.transformCSS('global-style', `${css`${BaseStyle.style}`}${css`${common.style}`}`),
  ];
  for (const name of componentNames) {
    const { default: style } = (await import(`primevue/${name}/style`)) as { default: ComponentStyle };
    const theme = style.getComponentTheme() ?? {};
    sheets.push(css`${theme.css}`, Theme.transformCSS(`${style.name}-style`, `${css`${style.style}`}${css`${theme.style}`}`));
    // A directive (ripple) has its variables under the directive's name as well.
    sheets.push(css`${style.getDirectiveTheme()?.css}`);
  }
  return [...new Set(sheets.filter((sheet): sheet is string => Boolean(sheet?.trim())))].join('\n');
}

export function prebuiltPrimeVueTheme(srcDir: string): Plugin {
  const require = createRequire(import.meta.url);
  // primevue/<name> resolves to <package>/<name>/index.mjs (its package.json itself is not exported).
  const primevueDir = path.dirname(path.dirname(require.resolve('primevue/config')));
  return {
    name: 'hodboard:prebuilt-primevue-theme',
    resolveId: (id) => (id === MODULE_ID ? RESOLVED_ID : undefined),
    async load(id) {
      if (id !== RESOLVED_ID) return undefined;
      const files = sourceFiles(srcDir);
      for (const file of files) this.addWatchFile(file);
      const names = componentsUsed(files, primevueDir);
      return primevueThemeCss(names);
    },
  };
}

const STYLE_SOURCE = /^@primeuix\/styles\/[a-z]+$/;
const NO_STYLE_ID = '\0primevue-no-theme-style';

/**
 * Each PrimeVue component's style module imports its theme CSS as a string (@primeuix/styles/<name>) for PrimeVue to
 * build the theme in the browser. With `theme: 'none'` PrimeVue never reads it (only the small core CSS each style
 * module carries itself), and the prebuilt stylesheet above has it already; this gives the browser bundle an empty
 * string in its place, some 30 KB gzip less on a first screen. Building the stylesheet in Node is not affected.
 */
export function primevueThemeStylesLeftOut(): Plugin {
  return {
    name: 'hodboard:primevue-theme-styles-left-out',
    // The build only: the unit tests make the stylesheet in Vite's own module runner, which must see the real CSS.
    apply: 'build',
    enforce: 'pre',
    resolveId: (id) => (STYLE_SOURCE.test(id) ? NO_STYLE_ID : undefined),
    load: (id) => (id === NO_STYLE_ID ? "export const style = '';" : undefined),
  };
}

