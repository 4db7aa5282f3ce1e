/** "1 page", "2 pages" (English plurals; an irregular plural is passed in). */
export function plural(n: number, one: string, many = `${one}s`): string {
  return `${n.toLocaleString()} ${n === 1 ? one : many}`;
}
