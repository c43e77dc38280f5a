import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import * as schemas from './index.js';

interface Def {
  type: string;
  [key: string]: unknown;
}

const defOf = (schema: unknown): Def | undefined =>
  schema && typeof schema === 'object' && '_zod' in schema ? (schema as { _zod: { def: Def } })._zod.def : undefined;

const WRAPPERS = new Set(['optional', 'nullable', 'default', 'prefault', 'catch', 'readonly', 'nonoptional']);

/** Whether a value at this position is read as text: a string, or a union or pipe that starts with one. */
function takesText(schema: unknown): boolean {
  const def = defOf(schema);
  if (!def) return false;
  if (def.type === 'string') return true;
  if (WRAPPERS.has(def.type)) return takesText(def.innerType);
  if (def.type === 'pipe') return takesText(def.in);
  if (def.type === 'union') return (def.options as unknown[]).some(takesText);
  return false;
}

/** Every position in a schema that takes text, by its path (`name`, `lines[].label`, `{}` for record values). */
function textPositions(schema: unknown, path: string, found: Array<[string, z.ZodType]>, seen = new Set<unknown>()): Array<[string, z.ZodType]> {
  const def = defOf(schema);
  if (!def || seen.has(schema)) return found;
  seen.add(schema);
  // The field as a whole is what the API parses, so a text position is checked as one and not taken apart.
  if (takesText(schema)) {
    found.push([path, schema as z.ZodType]);
    return found;
  }
  const children: Array<[string, unknown]> = [];
  if (def.type === 'object') children.push(...Object.entries(def.shape as Record<string, unknown>).map(([key, value]): [string, unknown] => [`${path}.${key}`, value]));
  if (WRAPPERS.has(def.type)) children.push([path, def.innerType]);
  if (def.type === 'pipe') children.push([path, def.in], [path, def.out]);
  if (def.type === 'array') children.push([`${path}[]`, def.element]);
  if (def.type === 'union') children.push(...(def.options as unknown[]).map((option): [string, unknown] => [path, option]));
  if (def.type === 'intersection') children.push([path, def.left], [path, def.right]);
  if (def.type === 'record') children.push([`${path}{}`, def.valueType]);
  if (def.type === 'tuple') children.push(...(def.items as unknown[]).map((item, i): [string, unknown] => [`${path}[${i}]`, item]));
  if (def.type === 'lazy') children.push([path, (def.getter as () => unknown)()]);
  for (const [childPath, child] of children) textPositions(child, childPath, found, seen);
  return found;
}

// Far above any real field and still inside the API's JSON body limit (100 kB), so only the field's own limit can refuse it.
// common practice, no source
const OVERSIZED = 'x'.repeat(100_000);

const positions = Object.entries(schemas)
  .filter(([, value]) => defOf(value))
  .flatMap(([name, schema]) => textPositions(schema, name, []));

describe('text limits of the payload schemas', () => {
  it('finds the text fields of the schemas it walks', () => {
    const found = textPositions(z.object({ a: z.string(), b: z.array(z.object({ c: z.string().optional() })), n: z.number() }), 'probe', []).map(([path]) => path);
    expect(found).toEqual(['probe.a', 'probe.b[].c']);
    expect(positions.map(([path]) => path)).toEqual(expect.arrayContaining(['clientInputSchema.name', 'siteInputSchema.accessNotes', 'jobInputSchema.description']));
  });

  it('would flag a text field without a limit', () => {
    const [[, unbounded]] = textPositions(z.object({ free: z.string().trim() }), 'probe', []) as [[string, z.ZodType]];
    expect(unbounded.safeParse(OVERSIZED).success).toBe(true);
  });

  it.each(positions)('%s refuses 100,000 characters', (_path, schema) => {
    expect(schema.safeParse(OVERSIZED).success).toBe(false);
  });
});
