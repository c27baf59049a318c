import { invalidRequest } from './errors';

/**
 * Request parameters as the SDK sends them: `application/x-www-form-urlencoded` with bracketed keys
 * (`items[0][price]=p`, `metadata[k]=v`, `expand[]=x`, `expand[0]=x`). Bracketed numbers become object
 * keys here (`metadata[7]` must stay a key); `Params.list` reads both `[n]` objects and `[]` arrays as
 * lists.
 */
export type ParamValue = string | ParamObject | ParamValue[];
export interface ParamObject {
  [key: string]: ParamValue;
}

function splitKey(key: string): string[] {
  const open = key.indexOf('[');
  if (open <= 0 || !key.endsWith(']')) return [key];
  const segments = [key.slice(0, open)];
  const rest = key.slice(open);
  const re = /\[([^\]]*)\]/g;
  let consumed = 0;
  for (let m = re.exec(rest); m; m = re.exec(rest)) {
    if (m.index !== consumed) return [key];
    segments.push(m[1]);
    consumed = m.index + m[0].length;
  }
  return consumed === rest.length ? segments : [key];
}

function assign(target: ParamObject, segments: string[], value: string): void {
  let node: ParamObject | ParamValue[] = target;
  for (let i = 0; i < segments.length; i++) {
    const last = i === segments.length - 1;
    const segment = segments[i];
    if (Array.isArray(node)) {
      if (last) {
        node.push(value);
        return;
      }
      const child: ParamObject | ParamValue[] = segments[i + 1] === '' ? [] : {};
      node.push(child);
      node = child;
      continue;
    }
    if (last) {
      node[segment] = value;
      return;
    }
    const wantArray = segments[i + 1] === '';
    const existing: ParamValue | undefined = node[segment];
    if (wantArray) {
      if (!Array.isArray(existing)) node[segment] = [];
    } else if (existing === undefined || typeof existing === 'string' || Array.isArray(existing)) {
      node[segment] = {};
    }
    node = node[segment] as ParamObject | ParamValue[];
  }
}

export function parseForm(raw: string): ParamObject {
  const out: ParamObject = {};
  for (const [key, value] of new URLSearchParams(raw)) assign(out, splitKey(key), value);
  return out;
}

/** JSON bodies (handy from `fetch` in tests) become the same string-valued tree as a form body. */
export function fromJson(value: unknown): ParamObject {
  const convert = (v: unknown): ParamValue => {
    if (v === null || v === undefined) return '';
    if (Array.isArray(v)) return v.map(convert);
    if (typeof v === 'object') {
      const o: ParamObject = {};
      for (const [k, inner] of Object.entries(v)) o[k] = convert(inner);
      return o;
    }
    return String(v);
  };
  const converted = convert(value);
  return typeof converted === 'object' && !Array.isArray(converted) ? converted : {};
}

const INTEGER = /^-?\d+$/;

/** Typed, validating reads of one parameter object; errors name the parameter as the API does. */
export class Params {
  constructor(
    private readonly values: ParamObject,
    private readonly prefix = '',
  ) {}

  name(key: string): string {
    return this.prefix ? `${this.prefix}[${key}]` : key;
  }

  has(key: string): boolean {
    return this.values[key] !== undefined;
  }

  keys(): string[] {
    return Object.keys(this.values);
  }

  raw(): ParamObject {
    return this.values;
  }

  /** Rejects any parameter not in `allowed`, like the API's `parameter_unknown`. */
  allowOnly(allowed: readonly string[]): this {
    for (const key of this.keys()) {
      if (!allowed.includes(key)) {
        throw invalidRequest(`Received unknown parameter: ${this.name(key)}`, this.name(key), 'parameter_unknown');
      }
    }
    return this;
  }

  private scalar(key: string): string | undefined {
    const v = this.values[key];
    if (v === undefined) return undefined;
    if (typeof v !== 'string') {
      throw invalidRequest(`Invalid ${this.name(key)}: must be a string`, this.name(key), 'parameter_invalid_string');
    }
    return v;
  }

  str(key: string): string | undefined {
    return this.scalar(key);
  }

  requireStr(key: string): string {
    const v = this.scalar(key);
    if (v === undefined || v === '') {
      throw invalidRequest(`Missing required param: ${this.name(key)}.`, this.name(key), 'parameter_missing');
    }
    return v;
  }

  /** `undefined` when absent, `null` for an empty string (the API's way to unset a field). */
  nullableStr(key: string): string | null | undefined {
    const v = this.scalar(key);
    if (v === undefined) return undefined;
    return v === '' ? null : v;
  }

  int(key: string, range: { min?: number; max?: number } = {}): number | undefined {
    const v = this.scalar(key);
    if (v === undefined || v === '') return undefined;
    if (!INTEGER.test(v)) {
      throw invalidRequest(`Invalid integer: ${v}`, this.name(key), 'parameter_invalid_integer');
    }
    const n = Number(v);
    if ((range.min !== undefined && n < range.min) || (range.max !== undefined && n > range.max)) {
      const bounds = `${range.min ?? '-inf'}..${range.max ?? 'inf'}`;
      throw invalidRequest(
        `Invalid ${this.name(key)}: must be in ${bounds}`,
        this.name(key),
        'parameter_invalid_integer',
      );
    }
    return n;
  }

  requireInt(key: string, range: { min?: number; max?: number } = {}): number {
    const n = this.int(key, range);
    if (n === undefined) {
      throw invalidRequest(`Missing required param: ${this.name(key)}.`, this.name(key), 'parameter_missing');
    }
    return n;
  }

  bool(key: string): boolean | undefined {
    const v = this.scalar(key);
    if (v === undefined || v === '') return undefined;
    if (v === 'true') return true;
    if (v === 'false') return false;
    throw invalidRequest(`Invalid boolean: ${v}`, this.name(key), 'parameter_invalid_boolean');
  }

  oneOf<T extends string>(key: string, allowed: readonly T[]): T | undefined {
    const v = this.scalar(key);
    if (v === undefined || v === '') return undefined;
    if (!(allowed as readonly string[]).includes(v)) {
      throw invalidRequest(
        `Invalid ${this.name(key)}: must be one of ${allowed.join(', ')}`,
        this.name(key),
        'parameter_invalid_string',
      );
    }
    return v as T;
  }

  obj(key: string): Params | undefined {
    const v = this.values[key];
    if (v === undefined || v === '') return undefined;
    if (typeof v === 'string' || Array.isArray(v)) {
      throw invalidRequest(`Invalid ${this.name(key)}: must be an object`, this.name(key), 'parameter_invalid_object');
    }
    return new Params(v, this.name(key));
  }

  /** A list sent as `k[0]=..&k[1]=..` or `k[]=..`; `undefined` when absent. */
  list(key: string): ParamValue[] | undefined {
    const v = this.values[key];
    if (v === undefined || v === '') return undefined;
    if (Array.isArray(v)) return v;
    if (typeof v === 'string') return [v];
    const indices = Object.keys(v);
    if (!indices.every((i) => INTEGER.test(i))) {
      throw invalidRequest(`Invalid array: ${this.name(key)}`, this.name(key), 'parameter_invalid_array');
    }
    return indices.sort((a, b) => Number(a) - Number(b)).map((i) => v[i]);
  }

  strList(key: string): string[] | undefined {
    const items = this.list(key);
    if (items === undefined) return undefined;
    return items.map((item, i) => {
      if (typeof item !== 'string') {
        throw invalidRequest(`Invalid ${this.name(key)}[${i}]: must be a string`, `${this.name(key)}[${i}]`);
      }
      return item;
    });
  }

  objList(key: string): Params[] | undefined {
    const items = this.list(key);
    if (items === undefined) return undefined;
    return items.map((item, i) => {
      if (typeof item === 'string' || Array.isArray(item)) {
        throw invalidRequest(`Invalid ${this.name(key)}[${i}]: must be an object`, `${this.name(key)}[${i}]`);
      }
      return new Params(item, `${this.name(key)}[${i}]`);
    });
  }

  /**
   * Metadata changes: `null` for "clear all" (`metadata=`), otherwise key -> value or null to delete
   * that key (`metadata[k]=`).
   */
  metadata(key = 'metadata'): Record<string, string | null> | null | undefined {
    const v = this.values[key];
    if (v === undefined) return undefined;
    if (v === '') return null;
    if (typeof v === 'string' || Array.isArray(v)) {
      throw invalidRequest(`Invalid ${this.name(key)}: must be an object`, this.name(key), 'parameter_invalid_object');
    }
    const out: Record<string, string | null> = {};
    for (const [k, inner] of Object.entries(v)) {
      if (typeof inner !== 'string') {
        throw invalidRequest(`Invalid ${this.name(key)}[${k}]: must be a string`, `${this.name(key)}[${k}]`);
      }
      if (inner.length > 500) {
        throw invalidRequest(`Metadata values can have up to 500 characters.`, `${this.name(key)}[${k}]`);
      }
      out[k] = inner === '' ? null : inner;
    }
    return out;
  }
}

/** Applies a `Params.metadata` change to existing metadata. */
export function applyMetadata(
  current: Record<string, string>,
  change: Record<string, string | null> | null | undefined,
): Record<string, string> {
  if (change === undefined) return current;
  if (change === null) return {};
  const next = { ...current };
  for (const [k, v] of Object.entries(change)) {
    if (v === null) delete next[k];
    else next[k] = v;
  }
  return next;
}
