/** The labels of the consensus window's fields, as the form shows them. */
export const fieldLabels = { Tmin: "From (K)", Tmax: "To (K)" } as const;

/**
 * A message about the window's parameters in the words of the form: the reader sees "From (K)"
 * and "To (K)", not the query names Tmin and Tmax (which the API's messages keep).
 */
export function inFormWords(message: string): string {
  return message.replace(/\b(Tmin|Tmax)\b/g, (name: string) => `“${fieldLabels[name as keyof typeof fieldLabels]}”`);
}
