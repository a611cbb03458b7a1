import type { ZodType } from 'zod';

/** What a field of an input schema takes, as far as a test needs to know to aim at it. */
export type FieldKind = 'text' | 'instant' | 'number' | 'boolean' | 'enum' | 'array' | 'object' | 'other';

interface Def {
  type: string;
  shape?: Record<string, ZodType>;
  innerType?: ZodType;
  in?: ZodType;
  out?: ZodType;
  options?: ZodType[];
  element?: ZodType;
  format?: string;
  checks?: { _zod: { def: { format?: string } } }[];
}

const def = (schema: ZodType) => (schema as unknown as { _zod: { def: Def } })._zod.def;

/** Looks through optional/nullable/default/pipe wrappers to the schema that checks the value. */
function core(schema: ZodType): ZodType {
  let s = schema;
  for (let i = 0; i < 20; i++) {
    const d = def(s);
    if (d.innerType) s = d.innerType;
    else if (d.type === 'pipe') s = def(d.in!).type === 'transform' ? d.out! : d.in!;
    else break;
  }
  return s;
}

function kindOf(schema: ZodType): FieldKind {
  const d = def(core(schema));
  if (d.type === 'string') return d.format === 'datetime' || d.checks?.some((c) => c._zod.def.format === 'datetime') ? 'instant' : 'text';
  if (d.type === 'number') return 'number';
  if (d.type === 'boolean') return 'boolean';
  if (d.type === 'enum' || d.type === 'literal') return 'enum';
  if (d.type === 'array') return 'array';
  if (d.type === 'object') return 'object';
  return 'other';
}

/**
 * The top-level objects an input schema accepts (several for a discriminated union), each as
 * field name → kind, plus the literal value of a discriminator where there is one.
 */
export function schemaObjects(schema: ZodType | undefined): { fields: Record<string, FieldKind>; literals: Record<string, unknown> }[] {
  if (!schema) return [];
  const s = core(schema);
  const d = def(s);
  if (d.type === 'union') return (d.options ?? []).flatMap((o) => schemaObjects(o));
  if (d.type !== 'object' || !d.shape) return [];
  const fields: Record<string, FieldKind> = {};
  const literals: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(d.shape)) {
    fields[key] = kindOf(value);
    const vd = def(core(value)) as Def & { values?: unknown[] };
    if (vd.type === 'literal' && vd.values?.length === 1) literals[key] = vd.values[0];
  }
  return [{ fields, literals }];
}

/** Fills a concrete path (`/tools/:id`) with values the routes parse: ids, tokens, codes. */
export const concretePath = (path: string) =>
  path.replace(/:(\w+)/g, (_m, name: string) => (/token|key/i.test(name) ? 'x'.repeat(43) : /code/i.test(name) ? 'NOPE' : '1'));
