/**
 * Follows a local `$ref` (`#/components/...`) of an OpenAPI document to the object it names;
 * any other node is answered as it is. The documents declare their shared answers, parameters
 * and schemas once in `components` and name them from each operation.
 */
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export function deref(doc: any, node: any): any {
  const ref: unknown = node?.$ref;
  if (typeof ref !== 'string' || !ref.startsWith('#/')) return node;
  const target = ref
    .slice(2)
    .split('/')
    .map((p) => p.replace(/~1/g, '/').replace(/~0/g, '~'))
    // eslint-disable-next-line @typescript-eslint/no-explicit-any
    .reduce((at: any, part) => at?.[part], doc);
  if (target === undefined) throw new Error(`${ref} names nothing in the document`);
  return deref(doc, target);
}

/** The JSON pointer of what a node stands for: its `$ref`'s target, or `at` itself. */
export function pointerOf(node: unknown, at: string): string {
  const ref = (node as { $ref?: unknown } | undefined)?.$ref;
  return typeof ref === 'string' && ref.startsWith('#/') ? ref.slice(2) : at;
}
