import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';
import type { Plugin } from 'vite';
import { sourceFiles } from './primevue-theme.ts';

const require = createRequire(import.meta.url);
const GLYPH_RULE = /\.pi-([a-z0-9-]+):before\s*\{\s*content:\s*"\\([0-9a-f]+)";?\s*\}\s*/g;
const FONT_FACE = /@font-face\s*\{[^}]*\}/;

/** The icon names (`pi-sun` → `sun`) the app's code mentions, as class names or in strings. */
export function iconsUsed(files: string[]): Set<string> {
  const names = new Set<string>();
  for (const file of files) for (const match of readFileSync(file, 'utf8').matchAll(/\bpi-([a-z0-9-]+)/g)) names.add(match[1]!);
  return names;
}

/**
 * primeicons.css with only the icons the app uses: their glyph rules, and a font cut down to their glyphs. The whole
 * font is 35 KB and about 300 icons; the app uses some 90, which take 12 KB.
 */
export async function primeiconsCss(css: string, fontDir: string, used: Set<string>): Promise<{ css: string; font: Buffer }> {
  const { Font, woff2 } = require('fonteditor-core') as typeof import('fonteditor-core');
  await woff2.init();
  const codepoints: number[] = [];
  const kept = css.replace(GLYPH_RULE, (rule, name: string, code: string) => {
    if (!used.has(name)) return '';
    codepoints.push(parseInt(code, 16));
    return rule;
  });
  const font = Font.create(readFileSync(path.join(fontDir, 'fonts', 'primeicons.ttf')), { type: 'ttf', subset: codepoints, hinting: false });
  const data = font.write({ type: 'woff2', toBuffer: true }) as Buffer;
  if (!FONT_FACE.test(kept)) throw new Error('primeicons.css has no @font-face to replace');
  return { css: kept, font: data };
}

function fontFace(url: string): string {
  return `@font-face {\n    font-family: 'primeicons';\n    font-display: block;\n    src: url(${url}) format('woff2');\n    font-weight: normal;\n    font-style: normal;\n}`;
}

/** The build's primeicons.css, cut down by primeiconsCss() to the icons the code under srcDir mentions. */
export function primeiconsSubset(srcDir: string): Plugin {
  return {
    name: 'hodboard:primeicons-subset',
    apply: 'build',
    // Ahead of Vite's own stylesheet handling, which would otherwise emit the whole font for the url() it finds.
    enforce: 'pre',
    async transform(code, id) {
      if (!/[\\/]primeicons[\\/]primeicons\.css$/.test(id)) return undefined;
      const { css, font } = await primeiconsCss(code, path.dirname(id), iconsUsed(sourceFiles(srcDir)));
      // Its own file, as the whole font was: written into the stylesheet it would hold back every screen's first paint.
      const reference = this.emitFile({ type: 'asset', name: 'primeicons.woff2', source: font });
      return css.replace(FONT_FACE, fontFace(`__VITE_ASSET__${reference}__`));
    },
  };
}
