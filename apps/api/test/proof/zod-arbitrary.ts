import fc from 'fast-check';
import type { ZodType } from 'zod';

/** What the generator needs to know about the world: ids that exist, so payloads can reach past "not found". */
export interface ArbitraryContext {
  ids: readonly string[];
}

interface Def {
  type: string;
  [key: string]: unknown;
}

const defOf = (schema: unknown): Def => (schema as { _zod: { def: Def } })._zod.def;
const isOptionalKey = (schema: unknown): boolean => (schema as { _zod: { optin?: string } })._zod.optin === 'optional';

interface Bounds {
  min?: number;
  max?: number;
  minInclusive: boolean;
  maxInclusive: boolean;
  isInt: boolean;
  format?: string;
  pattern?: RegExp;
}

function boundsOf(def: Def): Bounds {
  const bounds: Bounds = { minInclusive: true, maxInclusive: true, isInt: false };
  if (typeof def.format === 'string') bounds.format = def.format;
  if (def.pattern instanceof RegExp) bounds.pattern = def.pattern;
  for (const check of (def.checks as Array<{ _zod: { def: Record<string, unknown> } }> | undefined) ?? []) {
    const c = check._zod.def;
    switch (c.check) {
      case 'min_length':
        bounds.min = c.minimum as number;
        break;
      case 'max_length':
        bounds.max = c.maximum as number;
        break;
      case 'length_equals':
        bounds.min = bounds.max = c.length as number;
        break;
      case 'greater_than':
        bounds.min = c.value as number;
        bounds.minInclusive = Boolean(c.inclusive);
        break;
      case 'less_than':
        bounds.max = c.value as number;
        bounds.maxInclusive = Boolean(c.inclusive);
        break;
      case 'number_format':
        bounds.isInt = c.format === 'safeint' || c.format === 'int32' || c.format === 'uint32';
        break;
      case 'string_format':
        bounds.format = c.format as string;
        if (c.pattern instanceof RegExp) bounds.pattern = c.pattern;
        break;
    }
  }
  return bounds;
}

const isoDate = fc
  .date({ min: new Date('2026-01-01T00:00:00Z'), max: new Date('2028-12-31T00:00:00Z'), noInvalidDate: true })
  .map((date) => date.toISOString().slice(0, 10));
const letters = 'abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789 -,.';

function stringArbitrary(def: Def, context: ArbitraryContext): fc.Arbitrary<string> {
  const bounds = boundsOf(def);
  switch (bounds.format) {
    case 'uuid':
    case 'guid':
      return context.ids.length ? fc.oneof(fc.constantFrom(...context.ids), fc.uuid({ version: 4 })) : fc.uuid({ version: 4 });
    case 'date':
      return isoDate;
    case 'datetime':
      return fc.date({ min: new Date('2026-01-01T00:00:00Z'), max: new Date('2028-12-31T00:00:00Z'), noInvalidDate: true }).map((d) => d.toISOString());
    case 'time':
      return fc.tuple(fc.integer({ min: 0, max: 23 }), fc.integer({ min: 0, max: 59 })).map(([h, m]) => `${String(h).padStart(2, '0')}:${String(m).padStart(2, '0')}`);
    case 'email':
      return fc.stringMatching(/^[a-z]{1,10}@[a-z]{1,10}\.example$/);
    case 'url':
      return fc.stringMatching(/^https:\/\/[a-z]{1,10}\.example\/[a-z]{0,10}$/);
  }
  if (bounds.pattern) return fc.stringMatching(bounds.pattern).filter((s) => s.length >= (bounds.min ?? 0) && s.length <= (bounds.max ?? Infinity));
  const min = bounds.min ?? 0;
  const max = Math.min(bounds.max ?? 40, Math.max(min, 40));
  return fc.string({ unit: fc.constantFrom(...letters), minLength: min, maxLength: max });
}

function numberArbitrary(def: Def): fc.Arbitrary<number> {
  const b = boundsOf(def);
  const isInt = b.isInt;
  let min = b.min ?? (isInt ? -1000 : -1000);
  let max = b.max ?? min + 10_000;
  if (isInt) {
    if (!b.minInclusive) min = Math.floor(min) + 1;
    if (!b.maxInclusive) max = Math.ceil(max) - 1;
    return fc.integer({ min: Math.ceil(min), max: Math.floor(max) });
  }
  return fc.double({ min, max, minExcluded: !b.minInclusive, maxExcluded: !b.maxInclusive, noNaN: true, noDefaultInfinity: true });
}

/**
 * A fast-check arbitrary of mostly valid inputs for a zod 4 schema, read from its definition. Refinements across
 * fields are not modelled: the caller classifies each value with `safeParse`, so a miss only moves it to the
 * invalid side of the test.
 */
export function arbitraryOf(schema: ZodType, context: ArbitraryContext): fc.Arbitrary<unknown> {
  const def = defOf(schema);
  switch (def.type) {
    case 'string':
      return stringArbitrary(def, context);
    case 'number':
      return numberArbitrary(def);
    case 'boolean':
      return fc.boolean();
    case 'enum':
      return fc.constantFrom(...Object.values(def.entries as Record<string, string | number>));
    case 'literal':
      return fc.constantFrom(...(def.values as unknown[]));
    case 'null':
      return fc.constant(null);
    case 'object': {
      const shape = def.shape as Record<string, ZodType>;
      const keys = Object.keys(shape);
      const record: Record<string, fc.Arbitrary<unknown>> = {};
      for (const key of keys) record[key] = arbitraryOf(shape[key]!, context);
      return fc.record(record, { requiredKeys: keys.filter((key) => !isOptionalKey(shape[key])) });
    }
    case 'array': {
      const b = boundsOf(def);
      return fc.array(arbitraryOf(def.element as ZodType, context), { minLength: b.min ?? 0, maxLength: Math.min(b.max ?? 4, Math.max(b.min ?? 0, 4)) });
    }
    case 'record':
      return fc.dictionary(arbitraryOf(def.keyType as ZodType, context) as fc.Arbitrary<string>, arbitraryOf(def.valueType as ZodType, context), { maxKeys: 3 });
    case 'tuple':
      return fc.tuple(...(def.items as ZodType[]).map((item) => arbitraryOf(item, context)));
    case 'optional':
    case 'default':
    case 'prefault':
    case 'readonly':
    case 'catch':
    case 'nonoptional':
      return arbitraryOf(def.innerType as ZodType, context);
    case 'nullable':
      return fc.option(arbitraryOf(def.innerType as ZodType, context), { nil: null, freq: 4 });
    case 'union':
      return fc.oneof(...(def.options as ZodType[]).map((option) => arbitraryOf(option, context)));
    case 'intersection':
      return fc
        .tuple(arbitraryOf(def.left as ZodType, context), arbitraryOf(def.right as ZodType, context))
        .map(([left, right]) => ({ ...(left as object), ...(right as object) }));
    case 'pipe': {
      // `string().trim().pipe(z.email())` keeps its format on the out side; everything else is read from the in side.
      const inner = defOf(def.in);
      const out = defOf(def.out);
      const useOut = inner.type === 'string' && out.type === 'string' && !boundsOf(inner).format && boundsOf(out).format;
      return arbitraryOf((useOut ? def.out : def.in) as ZodType, context);
    }
    case 'lazy':
      return arbitraryOf((def.getter as () => ZodType)(), context);
    default:
      return fc.jsonValue({ maxDepth: 1 });
  }
}

export type FieldKind = 'string' | 'date' | 'id' | 'number' | 'boolean' | 'enum' | 'array' | 'object' | 'other';

/** The top-level fields of an object-like schema, with what kind of value each expects. */
export function fieldsOf(schema: ZodType): Array<{ key: string; kind: FieldKind; isRequired: boolean; schema: ZodType }> {
  const object = unwrapToObject(schema);
  if (!object) return [];
  const shape = defOf(object).shape as Record<string, ZodType>;
  return Object.entries(shape).map(([key, field]) => ({ key, kind: kindOf(field), isRequired: !isOptionalKey(field), schema: field }));
}

function unwrapToObject(schema: ZodType): ZodType | null {
  const def = defOf(schema);
  switch (def.type) {
    case 'object':
      return schema;
    case 'pipe':
      return unwrapToObject(def.in as ZodType);
    case 'optional':
    case 'nullable':
    case 'default':
      return unwrapToObject(def.innerType as ZodType);
    case 'intersection': {
      const left = unwrapToObject(def.left as ZodType);
      const right = unwrapToObject(def.right as ZodType);
      if (!left || !right) return left ?? right;
      // A synthetic object def is enough here: only its shape is read.
      return { _zod: { def: { type: 'object', shape: { ...(defOf(left).shape as object), ...(defOf(right).shape as object) } } } } as unknown as ZodType;
    }
    default:
      return null;
  }
}

function kindOf(schema: ZodType): FieldKind {
  const def = defOf(schema);
  switch (def.type) {
    case 'string': {
      const format = boundsOf(def).format;
      return format === 'date' ? 'date' : format === 'uuid' ? 'id' : 'string';
    }
    case 'number':
      return 'number';
    case 'boolean':
      return 'boolean';
    case 'enum':
    case 'literal':
      return 'enum';
    case 'array':
      return 'array';
    case 'object':
    case 'record':
      return 'object';
    case 'optional':
    case 'nullable':
    case 'default':
    case 'prefault':
      return kindOf(def.innerType as ZodType);
    case 'pipe':
      return kindOf(def.in as ZodType);
    default:
      return 'other';
  }
}
