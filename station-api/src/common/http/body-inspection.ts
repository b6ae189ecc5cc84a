/**
 * Checks a parsed JSON body before any DTO sees it: nesting depth, prototype keys and control characters.
 * class-transformer recurses without a bound (5,000 levels answered 500), drops `__proto__` silently, and
 * a NUL byte reached SQLite and the log; here each is refused with the path of the field.
 */

/** Deepest nesting accepted. The deepest real body (a plan version's steps with limits) is about 5. */
export const MAX_BODY_DEPTH = 32;

/** Keys that could reach an object's prototype, or would be dropped by class-transformer without a word. */
export const FORBIDDEN_KEYS: ReadonlySet<string> = new Set(['__proto__', 'constructor', 'prototype']);

/**
 * C0 control characters and DEL, except tab, line feed and carriage return (free-text notes and plan
 * files are multi-line). Unicode Standard §23.1 (control codes); the set is common practice, no source.
 */
// eslint-disable-next-line no-control-regex
const CONTROL = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F]/;

export interface BodyProblem {
  field: string;
  message: string;
}

/** Describes the first control character for the message, e.g. "U+0000". */
function controlName(s: string): string {
  const ch = CONTROL.exec(s)?.[0] ?? '';
  return `U+${ch.charCodeAt(0).toString(16).toUpperCase().padStart(4, '0')}`;
}

export function hasControlCharacter(s: string): boolean {
  return CONTROL.test(s);
}

/**
 * @returns the first problem found (depth-first), or null when the body is acceptable
 */
export function inspectBody(body: unknown): BodyProblem | null {
  // explicit stack: the walk itself must not be the thing that overflows on a deep body
  const stack: { value: unknown; path: string; depth: number }[] = [{ value: body, path: '', depth: 0 }];
  while (stack.length > 0) {
    const { value, path, depth } = stack.pop()!;
    if (typeof value === 'string') {
      if (hasControlCharacter(value)) {
        return { field: path || '(body)', message: `${path || 'The body'} contains a control character (${controlName(value)}); remove it and send plain text` };
      }
      continue;
    }
    if (value === null || typeof value !== 'object') continue;
    if (depth >= MAX_BODY_DEPTH) {
      return { field: path || '(body)', message: `${path || 'The body'} is nested more than ${MAX_BODY_DEPTH} levels deep; no request of this API needs that` };
    }
    if (Array.isArray(value)) {
      value.forEach((v, i) => stack.push({ value: v, path: `${path}[${i}]`, depth: depth + 1 }));
      continue;
    }
    for (const key of Object.keys(value)) {
      const field = path ? `${path}.${key}` : key;
      if (FORBIDDEN_KEYS.has(key)) return { field, message: `Field "${field}" is not allowed: "${key}" is a reserved name` };
      if (hasControlCharacter(key)) return { field, message: `A field name contains a control character (${controlName(key)})` };
      stack.push({ value: (value as Record<string, unknown>)[key], path: field, depth: depth + 1 });
    }
  }
  return null;
}
