// @vitest-environment node
import { readdirSync, readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';

const termsDir = new URL('../../../packages/shared/src/terms/', import.meta.url);
const sources = readdirSync(termsDir).filter((name) => name.endsWith('.ts') && !name.endsWith('.test.ts'));

describe("shared's terms", () => {
  it('are all here to check', () => {
    expect(sources).toContain('roles.ts');
  });

  // vite.config.ts builds the terms apart from the schemas chunk, so a screen that only shows words (the crew's
  // phone, at first) loads no zod. One import of a schema module, or of zod, from a terms file undoes that.
  it.each(sources)('%s imports nothing but other terms', (name) => {
    const code = readFileSync(new URL(name, termsDir), 'utf8');
    const imports = [...code.matchAll(/^\s*(?:import|export)\s[^;]*?from\s+'([^']+)'/gm)].map((match) => match[1]!);
    expect(imports.filter((path) => !/^\.\/[\w-]+\.js$/.test(path))).toEqual([]);
  });

  // The unit conversions and rounding build with the terms too (the board's weather reasons show them), so they
  // must bring nothing in either.
  it('are joined by rules/units.ts, which imports nothing', () => {
    const code = readFileSync(new URL('../rules/units.ts', termsDir), 'utf8');
    expect([...code.matchAll(/^\s*(?:import|export)\s[^;]*?from\s+'([^']+)'/gm)]).toEqual([]);
  });
});
