/** A number typed on a phone keypad ('12,5' reads as 12.5); undefined when empty, NaN when not a number. */
export function typedNumber(text: string | number | null | undefined): number | undefined {
  if (typeof text === 'number') return text
  return !text || text.trim() === '' ? undefined : Number(text.trim().replace(',', '.'))
}
