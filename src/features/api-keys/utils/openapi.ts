// Just enough of OpenAPI 3.1 to show the partner API's own document in our layout: the
// operations in order, their parameters, a flat table of each body's fields, examples,
// and a curl command with a placeholder where the shop's key goes.

export interface JsonSchema {
  $ref?: string;
  type?: string | string[];
  format?: string;
  description?: string;
  enum?: unknown[];
  const?: unknown;
  properties?: Record<string, JsonSchema>;
  required?: string[];
  items?: JsonSchema;
  anyOf?: JsonSchema[];
  oneOf?: JsonSchema[];
  allOf?: JsonSchema[];
  minLength?: number;
  maxLength?: number;
  minimum?: number;
  maximum?: number;
  exclusiveMinimum?: number;
  minItems?: number;
  maxItems?: number;
  default?: unknown;
  example?: unknown;
  examples?: unknown[];
}

export interface MediaObject {
  schema?: JsonSchema;
  example?: unknown;
}

export interface Parameter {
  name: string;
  in: 'query' | 'header' | 'path' | 'cookie';
  required?: boolean;
  description?: string;
  schema?: JsonSchema;
}

export interface Operation {
  tags?: string[];
  summary?: string;
  description?: string;
  security?: Record<string, string[]>[];
  parameters?: Parameter[];
  requestBody?: { required?: boolean; content: Record<string, MediaObject> };
  responses: Record<string, { description?: string; content?: Record<string, MediaObject> }>;
}

export interface OpenApiDocument {
  openapi: string;
  info: { title: string; version: string; description?: string };
  servers?: { url: string }[];
  security?: Record<string, string[]>[];
  tags?: { name: string; description?: string }[];
  paths: Record<string, Record<string, Operation>>;
  webhooks?: Record<string, Record<string, Operation>>;
  components?: { schemas?: Record<string, JsonSchema>; securitySchemes?: Record<string, { description?: string }> };
}

export const HTTP_METHODS = ['get', 'post', 'put', 'patch', 'delete'] as const;

export interface OperationEntry {
  id: string;
  method: (typeof HTTP_METHODS)[number];
  path: string;
  operation: Operation;
}

/** The operations in the document's order, each with an id for in-page links. */
export function operationsOf(doc: OpenApiDocument): OperationEntry[] {
  const entries: OperationEntry[] = [];
  for (const [path, item] of Object.entries(doc.paths ?? {})) {
    for (const method of HTTP_METHODS) {
      const operation = item[method];
      if (operation) entries.push({ id: `${method}-${path}`.replace(/[^a-zA-Z0-9]+/g, '-').replace(/-+$/, ''), method, path, operation });
    }
  }
  return entries;
}

export function resolve(doc: OpenApiDocument, schema: JsonSchema | undefined): JsonSchema | undefined {
  let current = schema;
  for (let depth = 0; current?.$ref && depth < 10; depth++) {
    const name = current.$ref.replace('#/components/schemas/', '');
    current = doc.components?.schemas?.[name];
  }
  return current;
}

/** "string (email)", "one of: a, b", "array of string", "integer". */
export function typeWords(doc: OpenApiDocument, schema: JsonSchema | undefined): string {
  const s = resolve(doc, schema);
  if (!s) return 'any';
  if (s.enum) return `one of: ${s.enum.map(String).join(', ')}`;
  if (s.const !== undefined) return `always ${JSON.stringify(s.const)}`;
  const variants = s.anyOf ?? s.oneOf;
  if (variants) {
    const words = variants.map((v) => typeWords(doc, v)).filter((w) => w !== 'null');
    const nullable = variants.some((v) => resolve(doc, v)?.type === 'null');
    return `${[...new Set(words)].join(' or ')}${nullable ? ' or null' : ''}`;
  }
  const type = Array.isArray(s.type) ? s.type.filter((t) => t !== 'null').join(' or ') + (s.type.includes('null') ? ' or null' : '') : s.type;
  if (type === 'array') return `array of ${typeWords(doc, s.items)}`;
  return s.format ? `${type ?? 'any'} (${s.format})` : (type ?? 'object');
}

function limits(s: JsonSchema): string[] {
  const out: string[] = [];
  if (s.minLength !== undefined && s.minLength > 0) out.push(s.minLength === 1 ? 'not empty' : `at least ${s.minLength} characters`);
  if (s.maxLength !== undefined) out.push(`at most ${s.maxLength} characters`);
  if (s.exclusiveMinimum !== undefined) out.push(`more than ${s.exclusiveMinimum}`);
  if (s.minimum !== undefined) out.push(`from ${s.minimum}`);
  if (s.maximum !== undefined) out.push(`up to ${s.maximum}`);
  if (s.minItems !== undefined && s.minItems > 0) out.push(`at least ${s.minItems} items`);
  if (s.maxItems !== undefined) out.push(`at most ${s.maxItems} items`);
  if (s.default !== undefined) out.push(`default ${JSON.stringify(s.default)}`);
  return out;
}

export interface FieldRow {
  /** Dotted path; array items as `[]`: `priorities[].category`. */
  name: string;
  type: string;
  required: boolean;
  notes: string;
}

/** Every field of a body, nested objects flattened, so it reads as one table. */
export function fieldRows(doc: OpenApiDocument, schema: JsonSchema | undefined, prefix = '', depth = 0): FieldRow[] {
  const s = resolve(doc, schema);
  if (!s || depth > 6) return [];
  const objectPart: Pick<JsonSchema, 'properties' | 'required'> = s.allOf
    ? {
        properties: Object.assign({}, ...s.allOf.map((p) => resolve(doc, p)?.properties ?? {})) as Record<string, JsonSchema>,
        required: s.allOf.flatMap((p) => resolve(doc, p)?.required ?? []),
      }
    : s;
  const rows: FieldRow[] = [];
  for (const [key, raw] of Object.entries(objectPart.properties ?? {})) {
    const child = resolve(doc, raw) ?? {};
    const name = prefix ? `${prefix}.${key}` : key;
    rows.push({
      name,
      type: typeWords(doc, child),
      required: (objectPart.required ?? []).includes(key),
      notes: [child.description, ...limits(child)].filter(Boolean).join('; '),
    });
    const inner = child.type === 'array' ? resolve(doc, child.items) : child;
    if (inner?.properties || inner?.allOf) rows.push(...fieldRows(doc, inner, child.type === 'array' ? `${name}[]` : name, depth + 1));
  }
  return rows;
}

/** The example a media object or its schema gives, if any. */
export function exampleOf(doc: OpenApiDocument, media: MediaObject | undefined): unknown {
  if (!media) return undefined;
  if (media.example !== undefined) return media.example;
  const s = resolve(doc, media.schema);
  return s?.example ?? s?.examples?.[0];
}

/** What goes where the shop's key belongs in every example. */
export const KEY_PLACEHOLDER = '<your API key>';

const shellQuote = (text: string) => `'${text.replace(/'/g, `'\\''`)}'`;

/** A curl command for the operation, with example values and the key placeholder. */
export function curlFor(doc: OpenApiDocument, entry: OperationEntry): string {
  const { operation, method } = entry;
  const server = doc.servers?.[0]?.url ?? '';
  let path = entry.path;
  for (const p of operation.parameters ?? []) {
    if (p.in !== 'path') continue;
    const value = resolve(doc, p.schema)?.example;
    path = path.replace(`{${p.name}}`, value !== undefined ? String(value) : `<${p.name}>`);
  }
  const lines = [`curl${method === 'get' ? '' : ` -X ${method.toUpperCase()}`} ${shellQuote(server + path)}`];
  const security = operation.security ?? doc.security ?? [];
  if (security.length > 0) lines.push(`-H "Authorization: Bearer ${KEY_PLACEHOLDER}"`);
  const idempotency = (operation.parameters ?? []).find((p) => p.in === 'header' && p.name === 'Idempotency-Key');
  if (idempotency) lines.push(`-H ${shellQuote(`Idempotency-Key: ${String(resolve(doc, idempotency.schema)?.example ?? 'a-unique-key')}`)}`);
  const content = operation.requestBody?.content ?? {};
  if (content['application/json']) {
    lines.push(`-H 'Content-Type: application/json'`);
    const example = exampleOf(doc, content['application/json']);
    lines.push(`-d ${shellQuote(JSON.stringify(example ?? {}, null, 2))}`);
  } else if (content['multipart/form-data']) {
    lines.push(`-F 'photos=@front.jpg'`, `-F 'photos=@label.jpg'`);
  }
  return lines.join(' \\\n  ');
}
