/**
 * JSON text for files people read and edit: indented like JSON.stringify(v, null, 2), except
 * that an array or object whose one-line form fits in the line width stays on one line, so a
 * point reads [12.5, 0] and a vertex { "at": [0, 20], "edge": "wide-edge" } instead of
 * spreading over six lines. The text parses back to exactly the same value.
 */

/** Formats value as JSON with a final newline; `width` is the preferred line length. */
export function formatJson(value: unknown, width = 100): string {
  return block(value, '', 0, width) + '\n';
}

function inline(v: unknown): string {
  if (Array.isArray(v)) return `[${v.map(inline).join(', ')}]`;
  if (v !== null && typeof v === 'object') {
    const entries = Object.entries(v).filter(([, x]) => x !== undefined);
    if (entries.length === 0) return '{}';
    return `{ ${entries.map(([k, x]) => `${JSON.stringify(k)}: ${inline(x)}`).join(', ')} }`;
  }
  return JSON.stringify(v) ?? 'null';
}

/** v laid out at the given indent, `lead` characters already used on its first line. */
function block(v: unknown, indent: string, lead: number, width: number): string {
  const one = inline(v);
  if (v === null || typeof v !== 'object' || indent.length + lead + one.length <= width) return one;
  const inner = indent + '  ';
  if (Array.isArray(v)) {
    if (v.length === 0) return '[]';
    return `[\n${v.map((x) => inner + block(x, inner, 0, width)).join(',\n')}\n${indent}]`;
  }
  const entries = Object.entries(v).filter(([, x]) => x !== undefined);
  if (entries.length === 0) return '{}';
  const lines = entries.map(([k, x]) => {
    const key = `${JSON.stringify(k)}: `;
    return inner + key + block(x, inner, key.length, width);
  });
  return `{\n${lines.join(',\n')}\n${indent}}`;
}
