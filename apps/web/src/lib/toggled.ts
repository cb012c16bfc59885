/** The list with `item` added (`on`) or taken out: what a checkbox in a group sets. */
export function toggled<T>(list: readonly T[], item: T, on: boolean): T[] {
  return on ? [...list, item] : list.filter((x) => x !== item);
}
