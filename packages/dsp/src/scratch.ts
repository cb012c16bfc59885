// Reusable work buffers for the hot paths. Internal (not exported from index.ts): a
// buffer handed out here is only valid until the next call with the same tag, so never
// return one to a caller, and never hold two of one tag at once. JavaScript runs one call
// at a time, which makes this safe.

const buffers = new Map<string, Float64Array>();

/**
 * A Float64Array of `length` for `tag`, reused across calls; contents are left over. One
 * buffer per tag, grown to the longest length asked for, so records of many different
 * lengths do not each keep a buffer of their own.
 */
export function scratch(tag: string, length: number): Float64Array {
  let buffer = buffers.get(tag);
  if (!buffer || buffer.length < length) {
    buffer = new Float64Array(length);
    buffers.set(tag, buffer);
  }
  return buffer.length === length ? buffer : buffer.subarray(0, length);
}
