// Form/query decoding in the processor's bracket notation (`a[b][0][c]=v`, `expand[]=x`) and the
// parameter readers that turn a bad value into an error in the processor's shape.

export type Params = { [key: string]: ParamValue };
export type ParamValue = string | Params | ParamValue[];

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly body: {
      type: 'invalid_request_error' | 'card_error' | 'api_error' | 'idempotency_error';
      code?: string;
      message: string;
      param?: string;
      decline_code?: string;
      payment_intent?: unknown;
      charge?: string;
    },
  ) {
    super(body.message);
  }
}

export function invalid(message: string, param?: string, code = 'parameter_invalid'): ApiError {
  return new ApiError(400, { type: 'invalid_request_error', code, message, ...(param ? { param } : {}) });
}

export function missingParam(param: string): ApiError {
  return new ApiError(400, {
    type: 'invalid_request_error',
    code: 'parameter_missing',
    message: `Missing required param: ${param}.`,
    param,
  });
}

export function noSuch(kind: string, id: string, param = 'id'): ApiError {
  return new ApiError(404, {
    type: 'invalid_request_error',
    code: 'resource_missing',
    message: `No such ${kind}: '${id}'`,
    param,
  });
}

/** Decodes `application/x-www-form-urlencoded` text with bracket keys into nested objects/arrays. */
export function decodeForm(text: string): Params {
  const root: Params = {};
  if (!text) return root;
  for (const pair of text.split('&')) {
    if (!pair) continue;
    const eq = pair.indexOf('=');
    const rawKey = eq < 0 ? pair : pair.slice(0, eq);
    const rawValue = eq < 0 ? '' : pair.slice(eq + 1);
    const key = decodeURIComponent(rawKey.replace(/\+/g, ' '));
    const value = decodeURIComponent(rawValue.replace(/\+/g, ' '));
    const head = key.match(/^[^[]+/);
    if (!head) continue;
    const path = [head[0]];
    for (const m of key.slice(head[0].length).matchAll(/\[([^\]]*)\]/g)) path.push(m[1] ?? '');
    assign(root, path, value);
  }
  return arrayify(root) as Params;
}

function assign(target: Params, path: string[], value: string): void {
  let node: Params = target;
  for (let i = 0; i < path.length; i++) {
    let seg = path[i]!;
    const last = i === path.length - 1;
    if (seg === '') {
      // `key[]`: append at the next free numeric slot
      seg = String(Object.keys(node).length);
    }
    if (last) {
      node[seg] = value;
      return;
    }
    const next = node[seg];
    if (typeof next !== 'object' || next === null || Array.isArray(next)) node[seg] = {};
    node = node[seg] as Params;
  }
}

function arrayify(value: ParamValue): ParamValue {
  if (typeof value === 'string' || Array.isArray(value)) return value;
  const keys = Object.keys(value);
  for (const k of keys) value[k] = arrayify(value[k]!);
  if (keys.length > 0 && keys.every((k) => /^\d+$/.test(k))) {
    return keys
      .map(Number)
      .sort((a, b) => a - b)
      .map((k) => value[String(k)]!);
  }
  return value;
}

/** Reads typed values out of decoded params; `prefix` builds the processor's bracketed param name. */
export class Reader {
  constructor(
    readonly params: Params,
    readonly prefix = '',
  ) {}

  name(key: string): string {
    return this.prefix ? `${this.prefix}[${key}]` : key;
  }

  has(key: string): boolean {
    return this.params[key] !== undefined;
  }

  rejectUnknown(allowed: readonly string[]): void {
    for (const key of Object.keys(this.params)) {
      if (key === 'expand' || allowed.includes(key)) continue;
      throw invalid(`Received unknown parameter: ${this.name(key)}`, this.name(key), 'parameter_unknown');
    }
  }

  str(key: string, opts: { required?: boolean; oneOf?: readonly string[]; maxLength?: number } = {}): string | undefined {
    const v = this.params[key];
    if (v === undefined || v === '') {
      if (opts.required) throw missingParam(this.name(key));
      return undefined;
    }
    if (typeof v !== 'string') throw invalid(`Invalid string: ${this.name(key)} must be a string.`, this.name(key));
    if (opts.oneOf && !opts.oneOf.includes(v)) {
      throw invalid(`Invalid ${this.name(key)}: must be one of ${opts.oneOf.join(', ')}.`, this.name(key));
    }
    if (opts.maxLength !== undefined && v.length > opts.maxLength) {
      throw invalid(`Invalid ${this.name(key)}: must be at most ${opts.maxLength} characters.`, this.name(key));
    }
    return v;
  }

  int(key: string, opts: { required?: boolean; min?: number; max?: number } = {}): number | undefined {
    const s = this.str(key, { required: opts.required });
    if (s === undefined) return undefined;
    if (!/^-?\d+$/.test(s)) throw invalid(`Invalid integer: ${s}`, this.name(key));
    const n = Number(s);
    if (!Number.isSafeInteger(n)) throw invalid(`Invalid integer: ${s}`, this.name(key));
    if (opts.min !== undefined && n < opts.min) {
      throw invalid(`Invalid ${this.name(key)}: must be at least ${opts.min}.`, this.name(key));
    }
    if (opts.max !== undefined && n > opts.max) {
      throw invalid(`Invalid ${this.name(key)}: must be at most ${opts.max}.`, this.name(key));
    }
    return n;
  }

  bool(key: string): boolean | undefined {
    const s = this.str(key);
    if (s === undefined) return undefined;
    if (s === 'true') return true;
    if (s === 'false') return false;
    throw invalid(`Invalid boolean: ${s}`, this.name(key));
  }

  obj(key: string, opts: { required?: boolean } = {}): Reader | undefined {
    const v = this.params[key];
    if (v === undefined || v === '') {
      if (opts.required) throw missingParam(this.name(key));
      return undefined;
    }
    if (typeof v !== 'object' || Array.isArray(v)) {
      throw invalid(`Invalid object: ${this.name(key)} must be an object.`, this.name(key));
    }
    return new Reader(v, this.name(key));
  }

  list(key: string, opts: { required?: boolean } = {}): Reader[] | undefined {
    const v = this.params[key];
    if (v === undefined || v === '') {
      if (opts.required) throw missingParam(this.name(key));
      return undefined;
    }
    if (!Array.isArray(v)) throw invalid(`Invalid array: ${this.name(key)} must be an array.`, this.name(key));
    return v.map((item, i) => {
      if (typeof item !== 'object' || Array.isArray(item)) {
        throw invalid(`Invalid object: ${this.name(key)}[${i}] must be an object.`, `${this.name(key)}[${i}]`);
      }
      return new Reader(item, `${this.name(key)}[${i}]`);
    });
  }

  strings(key: string): string[] | undefined {
    const v = this.params[key];
    if (v === undefined || v === '') return undefined;
    const arr = Array.isArray(v) ? v : [v];
    return arr.map((item, i) => {
      if (typeof item !== 'string') throw invalid(`Invalid string: ${this.name(key)}[${i}]`, `${this.name(key)}[${i}]`);
      return item;
    });
  }

  /** `metadata[key]=value`; an empty string for `metadata` clears it (returns {}). Processor limits: 50 keys, 40-char keys, 500-char values. */
  metadata(key = 'metadata'): Record<string, string> | undefined {
    const v = this.params[key];
    if (v === undefined) return undefined;
    if (v === '') return {};
    if (typeof v !== 'object' || Array.isArray(v)) throw invalid(`Invalid object: ${this.name(key)}`, this.name(key));
    const out: Record<string, string> = {};
    const entries = Object.entries(v);
    if (entries.length > 50) throw invalid(`Invalid ${this.name(key)}: at most 50 keys.`, this.name(key));
    for (const [k, val] of entries) {
      if (typeof val !== 'string') throw invalid(`Invalid ${this.name(key)}[${k}]: must be a string.`, `${this.name(key)}[${k}]`);
      if (k.length > 40) throw invalid(`Invalid ${this.name(key)}: keys are at most 40 characters.`, `${this.name(key)}[${k}]`);
      if (val.length > 500) throw invalid(`Invalid ${this.name(key)}[${k}]: values are at most 500 characters.`, `${this.name(key)}[${k}]`);
      out[k] = val;
    }
    return out;
  }
}

/** Applies a metadata update the way the processor does: an empty value removes the key. */
export function mergeMetadata(current: Record<string, string>, update: Record<string, string> | undefined): Record<string, string> {
  if (update === undefined) return current;
  if (Object.keys(update).length === 0) return {};
  const out = { ...current };
  for (const [k, v] of Object.entries(update)) {
    if (v === '') delete out[k];
    else out[k] = v;
  }
  return out;
}
