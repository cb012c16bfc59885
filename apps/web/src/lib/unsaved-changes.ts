/**
 * Unsaved edits are never thrown away without asking. An editor with unsaved edits registers
 * how to ask (its own confirmation dialog); actions that leave without a route change the
 * router could block — signing out — ask through `confirmLeaving()` first.
 */
type Ask = () => Promise<boolean>;

let ask: Ask | null = null;

/** Registers the question while there are unsaved edits; the returned function unregisters. */
export function registerUnsavedChanges(fn: Ask): () => void {
  ask = fn;
  return () => {
    if (ask === fn) ask = null;
  };
}

/** True when nothing is unsaved or the user chose to discard it. */
export function confirmLeaving(): Promise<boolean> {
  return ask ? ask() : Promise.resolve(true);
}
