/** A text control's value and its change handler, for a value kept in component state. */
export function bindValue(value: string, set: (value: string) => void) {
  return { value, onChange: (e: { target: { value: string } }) => set(e.target.value) };
}
