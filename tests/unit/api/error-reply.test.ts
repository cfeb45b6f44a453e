// The one mapping from errors to replies, shared by the Next routes (errorResponse) and the
// production server's direct probe-items path (handleProbeItems).
import { afterEach, describe, expect, it, vi } from 'vitest';
import { z } from 'zod';
import { errorReply } from '@/lib/server/http/error-reply';
import { ApiError, ValidationError } from '@/lib/server/errors';
import { errorResponse } from '@/lib/server/http/handler';
import { parseJsonText } from '@/lib/server/http/read-json';
import { probeItemsStudyId } from '@/lib/server/http/direct-api';

afterEach(() => vi.restoreAllMocks());

const parse = (error: unknown) => {
  const reply = errorReply(error);
  return { status: reply.status, headers: reply.headers, body: JSON.parse(reply.body) as Record<string, unknown> };
};

describe('errorReply', () => {
  it('answers an ApiError with its status and message, and issues when it has them', () => {
    expect(parse(new ApiError(404, 'Study not found.'))).toEqual({ status: 404, headers: { 'content-type': 'application/json' }, body: { error: 'Study not found.' } });
    const issues = [{ path: 'responses.cal-small-01', message: 'Unknown item.' }];
    expect(parse(new ValidationError(issues)).body).toEqual({ error: 'Some fields are invalid.', issues });
  });

  it('answers a ZodError with 422 naming the fields', () => {
    const result = z.strictObject({ participantId: z.string() }).safeParse({ participantId: 3, extra: true });
    const reply = parse(result.error);
    expect(reply.status).toBe(422);
    expect((reply.body.issues as Array<{ path: string }>).map((i) => i.path)).toEqual(expect.arrayContaining(['participantId', '(body)']));
  });

  it('answers an unreachable database with 503 "database unavailable" and Retry-After: 5', () => {
    const refused = Object.assign(new Error('connect ECONNREFUSED 127.0.0.1:1'), { code: 'ECONNREFUSED' });
    const reply = parse(Object.assign(new Error('wrapped'), { parent: refused }));
    expect(reply).toEqual({ status: 503, headers: { 'content-type': 'application/json', 'Retry-After': '5' }, body: { error: 'database unavailable' } });
  });

  it('answers anything else with 500 and a logged reference, without internals', () => {
    const log = vi.spyOn(console, 'error').mockImplementation(() => {});
    const reply = parse(new TypeError('secret internals at /srv/app'));
    expect(reply.status).toBe(500);
    const reference = /reference ([0-9a-f-]{36})/.exec(reply.body.error as string)?.[1];
    expect(reference).toBeDefined();
    expect(reply.body.error).not.toContain('internals');
    expect(log).toHaveBeenCalledWith(`[switchback] unexpected error ${reference}:`, expect.any(TypeError));
  });

  it('is what the Next routes answer too', async () => {
    const response = errorResponse(new ApiError(409, 'Stale.'));
    expect(response.status).toBe(409);
    expect(response.headers.get('content-type')).toBe('application/json');
    expect(await response.json()).toEqual({ error: 'Stale.' });
  });
});

describe('parseJsonText', () => {
  const schema = z.strictObject({ a: z.number() });
  it('refuses malformed JSON with 400 and schema failures with 422', () => {
    expect(parseJsonText('{"a":1}', schema)).toEqual({ a: 1 });
    expect(() => parseJsonText('{"a":', schema)).toThrow(expect.objectContaining({ status: 400 }));
    expect(() => parseJsonText('{"a":"x"}', schema)).toThrow(expect.objectContaining({ status: 422, issues: [expect.objectContaining({ path: 'a' })] }));
    expect(() => parseJsonText('', schema)).toThrow(expect.objectContaining({ status: 422 }));
  });
});

describe('probeItemsStudyId', () => {
  it('takes exactly POST /api/v1/studies/{id}/probe-items', () => {
    expect(probeItemsStudyId('POST', '/api/v1/studies/12/probe-items')).toBe('12');
    expect(probeItemsStudyId('POST', '/api/v1/studies/12/probe-items?x=1')).toBe('12');
    expect(probeItemsStudyId('POST', '/api/v1/studies/%31%32/probe-items')).toBe('12');
    expect(probeItemsStudyId('POST', '/api/v1/studies/abc/probe-items')).toBe('abc');
  });

  it('leaves everything else to Next', () => {
    expect(probeItemsStudyId('GET', '/api/v1/studies/12/probe-items')).toBeNull();
    expect(probeItemsStudyId('OPTIONS', '/api/v1/studies/12/probe-items')).toBeNull();
    expect(probeItemsStudyId('POST', '/api/v1/studies/12/probe-items/')).toBeNull();
    expect(probeItemsStudyId('POST', '/api/v1/studies/12/probe-items/x')).toBeNull();
    expect(probeItemsStudyId('POST', '/api/v1/studies/12/3/probe-items')).toBeNull();
    expect(probeItemsStudyId('POST', '/api/v1/studies//probe-items')).toBeNull();
    expect(probeItemsStudyId('POST', '/api/v1/studies/%E0%A4%A/probe-items')).toBeNull();
    expect(probeItemsStudyId('POST', '/api/studies/12/api-keys')).toBeNull();
  });
});
