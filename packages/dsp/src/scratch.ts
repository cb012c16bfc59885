// Reusable work buffers for the hot paths. Internal (not exported from index.ts): a
// buffer handed out here is only valid until the next call with the same tag and length,
// so never return one to a caller. JavaScript runs one call at a time, which makes this safe.

const buffers = new Map<string, Float64Array>();

/** A Float64Array of `length` for `tag`, reused across calls; contents are left over. */
export function scratch(tag: string, length: number): Float64Array {
  const key = `${tag}:${length}`;
  let buffer = buffers.get(key);
  if (!buffer) {
    buffer = new Float64Array(length);
    buffers.set(key, buffer);
  }
  return buffer;
}
