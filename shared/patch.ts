/** A PATCH body must change something: `{}` is refused with a clear message, not run as a no-op. */
export function hasSomeField(body: object): boolean {
  return Object.keys(body).length > 0;
}
