import { describe, expect, it } from 'vitest';
import { NotFoundError } from '@/lib/server/errors';
import { parseEntityId, parseRouteId } from '@/lib/server/route-ids';

describe('route ids', () => {
  it('accepts a positive whole number of 1 to 10 digits, leading zeros included', () => {
    expect(parseRouteId('42')).toBe(42);
    expect(parseRouteId('0042')).toBe(42);
    expect(parseRouteId('9999999999')).toBe(9_999_999_999);
  });

  it.each([undefined, '', '0', '0000000000', '-1', '+1', '1.5', '1e3', ' 1', '1 ', 'abc', '0x10', '12345678901'])(
    'bad input: %j is no id',
    (raw) => {
      expect(parseRouteId(raw)).toBeNull();
    },
  );

  it('turns a malformed id into "not found" naming the entity', () => {
    expect(parseEntityId('7', 'Design')).toBe(7);
    expect(() => parseEntityId('0', 'Power run')).toThrow(NotFoundError);
    expect(() => parseEntityId('x', 'Power run')).toThrow('Power run not found.');
  });
});
