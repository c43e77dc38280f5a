// @vitest-environment node
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { sourceFiles } from './primevue-theme.ts';
import { iconsUsed, primeiconsCss } from './primeicons-subset.ts';

const require = createRequire(import.meta.url);
const cssFile = require.resolve('primeicons/primeicons.css');
const fullCss = readFileSync(cssFile, 'utf8');
const srcDir = fileURLToPath(new URL('../src', import.meta.url));
/** Class names of primeicons.css that are not glyphs: sizes and the spinning animation. */
const NOT_GLYPHS = new Set(['spin', 'fw']);

describe('the cut-down icon font', () => {
  it('names only icons primeicons has, so none of the app\'s icons draws blank', () => {
    const used = [...iconsUsed(sourceFiles(srcDir))].filter((name) => !NOT_GLYPHS.has(name));
    expect(used.length).toBeGreaterThan(40);
    for (const name of used) expect(fullCss, `pi-${name}`).toContain(`.pi-${name}:before`);
  });

  it('keeps the glyph rules and glyphs of the icons asked for and drops the rest', async () => {
    const { Font, woff2 } = require('fonteditor-core') as typeof import('fonteditor-core');
    const { css, font } = await primeiconsCss(fullCss, path.dirname(cssFile), new Set(['sun', 'check']));
    expect(css).toMatch(/\.pi-sun:before\s*\{/);
    expect(css).toMatch(/\.pi-check:before\s*\{/);
    expect(css).not.toMatch(/\.pi-apple:before/);
    const code = (name: string) => parseInt(new RegExp(`\\.pi-${name}:before\\s*\\{\\s*content:\\s*"\\\\([0-9a-f]+)"`).exec(fullCss)![1]!, 16);
    await woff2.init();
    const glyphs = Font.create(font, { type: 'woff2' }).get().cmap;
    expect(Object.keys(glyphs).map(Number).sort()).toEqual(expect.arrayContaining([code('sun'), code('check')]));
    expect(glyphs[code('apple')]).toBeUndefined();
    expect(font.length).toBeLessThan(4_000);
  });
});
