import fc from 'fast-check';
import type { FieldKind } from './zod-arbitrary.js';

// A body of 100,000 characters passes the 100 kB JSON limit once quoted; query strings stay under Node's
// 16 KiB header limit, past which Node answers 431 itself before the app sees the request.
export const HUGE_BODY_STRING = 'ż'.repeat(50_000);
export const HUGE_QUERY_STRING = 'x'.repeat(8_000);

export const oddStrings = [
  '',
  ' ',
  'nul\u0000inside',
  '\u0000',
  '🧱👷‍♀️🏗️',
  '\u202Eevil\u202C',
  'مرحبا بالعالم',
  'שלום',
  '𝔘𝔫𝔦𝔠𝔬𝔡𝔢',
  'a\uD800b',
  '<script>alert(1)</script>',
  "'; DROP TABLE jobs; --",
  '../../etc/passwd',
  '%00%ff',
  'Ünïcödé  ',
  '\r\n\t',
];

export const oddNumbers = [-1, -0.5, 0, 0.5, 1.5, -2147483649, 2147483648, Number.MAX_SAFE_INTEGER + 1, 1e308, -1e308, Number.MIN_VALUE];

// Shaped like dates, but no such day, or far outside any diary.
export const oddDates = ['2027-02-30', '2027-02-29', '2027-13-01', '2027-00-10', '0000-01-01', '99999-01-01', '2027-1-1', '2027/03/01', '1900-01-01', '9999-12-31', '2027-03-01T25:00:00Z', 'tomorrow'];

export const wrongTypes: unknown[] = [123, -1, 1.5, true, false, null, [], [1, 2], {}, { nested: { deep: true } }, 'text', ''];

export interface Field {
  key: string;
  kind: FieldKind;
  isRequired: boolean;
}

export type Mutation = { name: string; apply: (value: Record<string, unknown>) => unknown };

/**
 * The kinds of mutation of an object payload, one generator each: a field of the wrong type, missing, too long, odd
 * text or numbers, bad dates, extras. A route is sent every kind its fields allow.
 */
export function bodyMutations(fields: Field[]): Array<fc.Arbitrary<Mutation>> {
  const any = fields.length ? fc.constantFrom(...fields) : fc.constant<Field>({ key: 'unexpected', kind: 'other', isRequired: false });
  const required = fields.filter((field) => field.isRequired);
  const strings = fields.filter((field) => field.kind === 'string' || field.kind === 'id' || field.kind === 'enum' || field.kind === 'other');
  const numbers = fields.filter((field) => field.kind === 'number');
  const dates = fields.filter((field) => field.kind === 'date');
  const set = (key: string, v: unknown) => (value: Record<string, unknown>) => ({ ...value, [key]: v });

  const options: Array<fc.Arbitrary<Mutation>> = [
    fc.tuple(any, fc.constantFrom(...wrongTypes)).map(([field, v]) => ({ name: `${field.key} = ${JSON.stringify(v)}`, apply: set(field.key, v) })),
    any.map((field) => ({ name: `${field.key} huge`, apply: set(field.key, HUGE_BODY_STRING) })),
    fc.tuple(any, fc.constantFrom(...oddStrings)).map(([field, v]) => ({ name: `${field.key} = ${JSON.stringify(v)}`, apply: set(field.key, v) })),
    fc.constant({ name: 'extra keys', apply: (value: Record<string, unknown>) => ({ ...value, isAdmin: true, firmId: '00000000-0000-4000-8000-000000000000', ['__proto__']: { polluted: true } }) }),
    fc.constant({ name: 'array instead of object', apply: (value: Record<string, unknown>) => [value] }),
    fc.constant({ name: 'string instead of object', apply: () => 'just text' }),
    fc.constant({ name: 'empty object', apply: () => ({}) }),
    any.map((field) => ({ name: `${field.key} as array`, apply: (value: Record<string, unknown>) => ({ ...value, [field.key]: [value[field.key], value[field.key]] }) })),
  ];
  if (required.length) {
    options.push(fc.constantFrom(...required).map((field) => ({
      name: `without ${field.key}`,
      apply: (value: Record<string, unknown>) => Object.fromEntries(Object.entries(value).filter(([key]) => key !== field.key)),
    })));
  }
  if (strings.length) {
    options.push(fc.tuple(fc.constantFrom(...strings), fc.constantFrom(...oddStrings)).map(([field, v]) => ({ name: `${field.key} = ${JSON.stringify(v)}`, apply: set(field.key, v) })));
  }
  if (numbers.length) {
    options.push(fc.tuple(fc.constantFrom(...numbers), fc.constantFrom(...oddNumbers)).map(([field, v]) => ({ name: `${field.key} = ${v}`, apply: set(field.key, v) })));
    options.push(fc.tuple(fc.constantFrom(...numbers), fc.constantFrom(...oddNumbers.filter((n) => n < 0))).map(([field, v]) => ({ name: `${field.key} = ${v}`, apply: set(field.key, v) })));
    options.push(fc.constantFrom(...numbers).map((field) => ({ name: `${field.key} as text`, apply: set(field.key, '12abc') })));
  }
  if (dates.length) {
    options.push(fc.tuple(fc.constantFrom(...dates), fc.constantFrom(...oddDates)).map(([field, v]) => ({ name: `${field.key} = ${v}`, apply: set(field.key, v) })));
  }
  return options;
}

/** The same for a query string, where every value travels as text. */
export function queryMutations(fields: Field[]): Array<fc.Arbitrary<Mutation>> {
  const any = fields.length ? fc.constantFrom(...fields) : fc.constant<Field>({ key: 'unexpected', kind: 'other', isRequired: false });
  const required = fields.filter((field) => field.isRequired);
  const set = (key: string, v: unknown) => (value: Record<string, unknown>) => ({ ...value, [key]: v });
  const numbers = fields.filter((field) => field.kind === 'number');
  const dates = fields.filter((field) => field.kind === 'date');
  const options: Array<fc.Arbitrary<Mutation>> = [
    fc.tuple(any, fc.constantFrom('abc', '1.5', '1e999', 'NaN', 'Infinity', 'true', '', '[]', '{}', '0x10')).map(([field, v]) => ({ name: `${field.key}=${v}`, apply: set(field.key, v) })),
    fc.tuple(numbers.length ? fc.constantFrom(...numbers) : any, fc.constantFrom('-1', '-0.5', '-2147483649')).map(([field, v]) => ({ name: `${field.key}=${v}`, apply: set(field.key, v) })),
    fc.tuple(dates.length ? fc.constantFrom(...dates) : any, fc.constantFrom(...oddDates)).map(([field, v]) => ({ name: `${field.key}=${v}`, apply: set(field.key, v) })),
    fc.tuple(any, fc.constantFrom(...oddStrings)).map(([field, v]) => ({ name: `${field.key}=${JSON.stringify(v)}`, apply: set(field.key, v) })),
    any.map((field) => ({ name: `${field.key} huge`, apply: set(field.key, HUGE_QUERY_STRING) })),
    any.map((field) => ({ name: `${field.key} repeated`, apply: (value: Record<string, unknown>) => ({ ...value, [field.key]: ['1', '2'] }) })),
    any.map((field) => ({ name: `${field.key} nested`, apply: (value: Record<string, unknown>) => ({ ...value, [`${field.key}[a]`]: 'b' }) })),
  ];
  if (required.length) {
    options.push(fc.constantFrom(...required).map((field) => ({
      name: `without ${field.key}`,
      apply: (value: Record<string, unknown>) => Object.fromEntries(Object.entries(value).filter(([key]) => key !== field.key)),
    })));
  }
  return options;
}

/** Path segments that are not what the route's params expect. */
export const oddPathSegments = ['not-an-id', '0', '-1', '%00', '%', '%E0%A4%A', '%F0%9F%A7%B1', 'x'.repeat(2_000), '..%2F..%2Fetc', '00000000-0000-0000-0000-00000000000g', "1' OR '1'='1"];
