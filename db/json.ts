/**
 * The one decoder of JSON columns. MariaDB keeps JSON as LONGTEXT, so depending on the query path
 * (a model read, a raw query, JSON_EXTRACT) a value comes back either parsed or as its text.
 */
export function decodeJson<T>(value: T | string): T {
  return typeof value === 'string' ? (JSON.parse(value) as T) : value;
}
