import { BODY_ENDPOINT_ERRORS, errorReplies, preflight, sessionTokenHeader, studyIdParameter } from '@/lib/server/http/openapi-replies';
import { SESSION_TAG_TEXT, sessionPaths, sessionSchemas } from '@/lib/server/http/session-openapi';

/**
 * The OpenAPI 3.1 description of the probe-items API, served at /api/v1/openapi.json.
 * Schemas mirror lib/shared/validations/item-bank.ts (request) and lib/design/item-bank (items).
 */
export function probeApiDocument(serverUrl: string) {
  const rate = {
    type: 'object',
    required: ['rate', 'standardErrorLog', 'interval', 'flags'],
    properties: {
      rate: { type: 'number', description: 'ML estimate of the discount rate, per day' },
      standardErrorLog: { type: ['number', 'null'], description: 'standard error of ln k; null when flagged' },
      interval: { oneOf: [{ type: 'null' }, { type: 'object', properties: { lower: { type: 'number' }, upper: { type: 'number' } } }] },
      flags: { type: 'array', items: { type: 'string', enum: ['all-sooner', 'all-later', 'boundary', 'non-monotone'] } },
    },
  };
  return {
    openapi: '3.1.0',
    info: {
      title: 'Switchback session API',
      version: '1.0.0',
      description:
        'Second-stage (probe block) items for a two-stage delay-discounting study, computed per participant from the calibration block. ' +
        'Estimates describe hypothetical choices; they are not a clinical assessment. Rate limit: per key, shared by every server process of an installation that sets REDIS_URL and per ' +
        'server process otherwise (default a burst of 200, then 100 requests a second; browser keys: 120, then 30 a second); 429 carries Retry-After. ' +
        SESSION_TAG_TEXT,
    },
    servers: [{ url: serverUrl }],
    security: [{ studyKey: [] }],
    paths: {
      '/api/v1/studies/{id}/probe-items': {
        post: {
          operationId: 'serveProbeItems',
          summary: "A participant's personalised probe and anchor items",
          description:
            'Idempotent per participant: the same participant id with the same responses returns the same items; different responses for a participant ' +
            'already served give 409 and change nothing. Participants flagged all-sooner, all-later or non-monotone (or whose estimates have no reversal ' +
            'zone) get the fallback set (itemSet "fallback": the probe block built at the prior medians, as in the exported item bank) and the flag. ' +
            'The items use the key\'s presentation settings, the same units as its calibration block. ' +
            'The stage-2 block\'s length varies between participants: personalised pairs are built around each person\'s reversal zone, and late or soon ' +
            'anchor pairs that do not fit (no room below the zone, or beyond the design\'s late-delay limit) are left out; flagged participants get the ' +
            'fallback set, whose length is the bank\'s. Use the items array as given. ' +
            'Browsers: CORS headers on every reply for the key\'s listed origins; a browser key sends the participant\'s session token (X-Session-Token).',
          parameters: [studyIdParameter, sessionTokenHeader],
          requestBody: {
            required: true,
            content: {
              'application/json': {
                schema: {
                  type: 'object',
                  additionalProperties: false,
                  required: ['participantId', 'responses'],
                  properties: {
                    participantId: { type: 'string', maxLength: 128, pattern: '^[\\w.:@-]+$' },
                    responses: {
                      type: 'object',
                      description: 'calibration item id → chosen option; every calibration item must be answered; check-calibration is optional',
                      additionalProperties: { type: 'string', enum: ['sooner', 'later'] },
                    },
                    itemBankId: { type: 'string', pattern: '^[0-9a-f]{16}$', description: 'the item-bank id of the calibration items shown (calibration reply or export header); answers to another item bank are refused with 422' },
                  },
                },
                example: { participantId: 'P-017', itemBankId: '9a41c07e55d2b310', responses: { 'cal-small-01': 'sooner', 'cal-small-02': 'later', 'cal-large-01': 'later', 'check-calibration': 'sooner' } },
              },
            },
          },
          responses: {
            '200': { description: 'the participant\'s items', content: { 'application/json': { schema: { $ref: '#/components/schemas/ProbeItems' } } } },
            ...errorReplies(BODY_ENDPOINT_ERRORS, {
              '409': { description: 'participant already served with different responses, or through another design version', example: 'Participant P-017 was already served with different calibration responses (or another design version); their items stay as served.' },
              '422': {
                description: 'unknown item ids, missing responses or invalid choices (issues name the items); an itemBankId other than the key\'s',
                example: 'Some fields are invalid.',
              },
            }),
          },
        },
        options: preflight('probeItemsPreflight'),
      },
      // Two-stage session endpoints (issue 13)
      ...sessionPaths(),
    },
    components: {
      securitySchemes: { studyKey: { type: 'http', scheme: 'bearer', description: 'a study API key, server or browser kind (created by an operator; shown once)' } },
      schemas: {
        ...sessionSchemas(),
        Issue: { type: 'object', properties: { path: { type: 'string' }, message: { type: 'string' } } },
        Item: {
          type: 'object',
          required: ['id', 'block', 'role', 'set', 'view', 'pairId', 'magnitude', 'soonerAmount', 'soonerDelay', 'laterAmount', 'laterDelay', 'soonerSide', 'position', 'text'],
          properties: {
            id: { type: 'string' },
            block: { type: 'string', enum: ['calibration', 'probe'] },
            role: { type: 'string', enum: ['calibration', 'reversal-probe', 'late-anchor', 'soon-anchor', 'attention-check'] },
            set: { type: 'string', enum: ['shared', 'personal', 'fallback'] },
            view: { type: ['string', 'null'], enum: ['far', 'near', null] },
            pairId: { type: ['string', 'null'] },
            magnitude: { type: ['string', 'null'], enum: ['small', 'large', null] },
            soonerAmount: { type: 'number' },
            soonerDelay: { type: 'integer', description: 'days' },
            laterAmount: { type: 'number' },
            laterDelay: { type: 'integer', description: 'days' },
            soonerSide: { type: 'string', enum: ['left', 'right'] },
            position: { type: 'integer', description: '1-based, presentation order within the block' },
            text: { type: 'string' },
          },
        },
        ProbeItems: {
          type: 'object',
          required: ['participantId', 'designHash', 'estimates', 'flag', 'itemSet', 'extrapolation', 'attentionCheck', 'items', 'servedAt'],
          properties: {
            participantId: { type: 'string' },
            designHash: { type: 'string', description: 'SHA-256 of the frozen design version' },
            estimates: { type: 'object', properties: { kSmall: rate, kLarge: rate, choiceSensitivity: { type: 'number' } } },
            flag: { type: ['string', 'null'], enum: ['all-sooner', 'all-later', 'non-monotone', 'no-zone', null] },
            itemSet: { type: 'string', enum: ['personal', 'fallback', 'shared'] },
            extrapolation: { oneOf: [{ type: 'null' }, { type: 'object', properties: { message: { type: 'string' }, factor: { type: 'number' } } }] },
            attentionCheck: { type: 'string', enum: ['passed', 'failed', 'not-answered'] },
            items: { type: 'array', items: { $ref: '#/components/schemas/Item' } },
            rounding: { type: 'array', items: { type: 'object' } },
            servedAt: { type: 'string', format: 'date-time' },
          },
        },
      },
    },
  };
}
