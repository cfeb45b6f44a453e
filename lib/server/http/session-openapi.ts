// The OpenAPI 3.1 description of the two-stage session endpoints (calibration block, stage-2
// answers) and what they add to the probe-items endpoint; merged into the document served at
// /api/v1/openapi.json by probeApiDocument. Schemas mirror lib/shared/validations/session.ts.
import { BODY_ENDPOINT_ERRORS, errorReplies, preflight, sessionTokenHeader as token, studyIdParameter as id } from './openapi-replies';

const corsNote =
  'Browsers: every reply, errors and 429 included, carries Access-Control-Allow-Origin for the origins the key lists (Retry-After is exposed); ' +
  'the preflight (OPTIONS) is answered for origins listed by any active key of the study.';

export const SESSION_TAG_TEXT =
  'A two-stage session: (1) GET the calibration block (with a participant id it starts the session), (2) POST the calibration answers to probe-items ' +
  'and receive the stage-2 block, (3) POST the stage-2 answers, in one or several parts. Server keys (the lab\'s back end) may act for any participant of ' +
  'their study; browser keys (safe inside a public page) only from their listed origins, with their own rate limit, and for one participant at a time ' +
  'with that participant\'s session token.';

/** Paths of the session endpoints. */
export function sessionPaths() {
  return {
    '/api/v1/studies/{id}/calibration': {
      get: {
        operationId: 'calibrationBlock',
        summary: 'The calibration block as the lab presents it',
        description:
          'The calibration items (and the calibration attention check) of the key\'s frozen design version, in the key\'s presentation settings: delay unit ' +
          '(days, weeks or 30-day months), the fewest other items between the two views of a pair, and the seed of order and sides. Amounts, currency and ' +
          'wording are as in an export with the same settings; `itemBankId` names those items, and an export with the same settings shows the same id. ' +
          'Send it back with the calibration answers: answers to another item bank are refused (422), never rescored. With `participantId` the call ' +
          'starts that participant\'s session (status "started"); for a browser key it is required, and the reply holds the session token once. ' +
          corsNote,
        parameters: [
          id,
          { name: 'participantId', in: 'query', required: false, schema: { type: 'string', maxLength: 128, pattern: '^[\\w.:@-]+$' } },
          { name: 'order', in: 'query', required: false, schema: { type: 'string', enum: ['bank', 'participant'], default: 'bank' }, description: 'participant: the block shuffled per participant (seeded: the same order on every call)' },
          token,
        ],
        responses: {
          '200': {
            description: 'the calibration block',
            content: {
              'application/json': {
                schema: { $ref: '#/components/schemas/CalibrationBlock' },
                example: {
                  participantId: 'P-017',
                  designVersionId: 3,
                  designHash: '5f0c…',
                  itemBankId: '9a41c07e55d2b310',
                  presentation: { seed: 1594623390, delayUnit: 'weeks', minGap: 2, amountUnit: 1, currency: 'EUR', monthDays: 30 },
                  order: 'bank',
                  items: [{ id: 'cal-small-01', block: 'calibration', role: 'calibration', set: 'shared', view: null, pairId: null, magnitude: 'small', soonerAmount: 55, soonerDelay: 0, laterAmount: 60, laterDelay: 14, soonerSide: 'left', position: 1, text: '€55 today or €60 in 2 weeks?' }],
                  sessionToken: 'q3N…(browser keys, once)',
                  caution: 'Estimates describe hypothetical choices of this participant; they are not a clinical assessment.',
                },
              },
            },
          },
          ...errorReplies(['401', '403', '404', '409', '422', '429', '503'], {
            '403': { description: 'a browser key without a listed Origin, or a key used from an origin it does not list', example: 'This key may not be used from https://elsewhere.example; an operator can add the origin to the key\'s list.' },
            '409': { description: 'browser key: this participant\'s session already started; resume with its token', example: "Participant P-017's session has already started; resume it with its session token (X-Session-Token)." },
            '422': { description: 'bad query (names the parameter); a browser key without participantId', example: 'Some fields are invalid.' },
          }),
        },
      },
      options: preflight('calibrationPreflight'),
    },
    '/api/v1/studies/{id}/stage2-answers': {
      post: {
        operationId: 'recordStage2Answers',
        summary: "A participant's answers to their stage-2 items",
        description:
          'The chosen option for items of the stage-2 block served to this participant (optionally the response time and the side the smaller-sooner option was shown on). ' +
          'Idempotent: an answer sent again is not an error and changes nothing. A different answer to an item already answered gives 409; the first answer stays ' +
          '(other, new answers in the same request are recorded and the message says so). Answers may arrive in parts: a participant who drops out keeps what ' +
          'they answered; the session reads "completed" once every served item is answered. The stage-2 block\'s length varies between participants (see probe-items), ' +
          'so read `itemCount` and `unanswered` rather than assuming a length. An empty `answers` list reads the progress. ' +
          corsNote,
        parameters: [id, token],
        requestBody: {
          required: true,
          content: {
            'application/json': {
              schema: {
                type: 'object',
                additionalProperties: false,
                required: ['participantId', 'answers'],
                properties: {
                  participantId: { type: 'string', maxLength: 128, pattern: '^[\\w.:@-]+$' },
                  answers: {
                    type: 'array',
                    maxItems: 200,
                    items: {
                      type: 'object',
                      additionalProperties: false,
                      required: ['itemId', 'chosen'],
                      properties: {
                        itemId: { type: 'string', maxLength: 64, description: 'an item id from this participant\'s probe-items reply' },
                        chosen: { type: 'string', enum: ['sooner', 'later'], description: 'sooner: the smaller-sooner option; later: the larger-later one' },
                        responseTimeMs: { type: 'integer', minimum: 0, maximum: 86400000 },
                        sideShown: { type: 'string', enum: ['left', 'right'], description: 'where the smaller-sooner option was shown' },
                      },
                    },
                  },
                },
              },
              example: { participantId: 'P-017', answers: [{ itemId: 'probe-1-far', chosen: 'later', responseTimeMs: 2140, sideShown: 'left' }, { itemId: 'probe-1-near', chosen: 'sooner', responseTimeMs: 1810, sideShown: 'right' }] },
            },
          },
        },
        responses: {
          '200': {
            description: 'how much of the block is answered',
            content: {
              'application/json': {
                schema: {
                  type: 'object',
                  required: ['participantId', 'recorded', 'answered', 'itemCount', 'status', 'unanswered'],
                  properties: {
                    participantId: { type: 'string' },
                    recorded: { type: 'integer', description: 'answers of this request that were new' },
                    answered: { type: 'integer' },
                    itemCount: { type: 'integer' },
                    status: { type: 'string', enum: ['served', 'completed'] },
                    unanswered: { type: 'array', items: { type: 'string' } },
                    reward: { $ref: '#/components/schemas/Reward' },
                  },
                },
                example: { participantId: 'P-017', recorded: 2, answered: 2, itemCount: 9, status: 'served', unanswered: ['late-1-far', 'soon-1-near'] },
              },
            },
          },
          ...errorReplies(BODY_ENDPOINT_ERRORS, {
            '409': { description: 'an item already has a different answer (named); or the participant was served through another design version', example: 'Participant P-017 already answered probe-1-far differently; the first answers stay.' },
            '422': { description: 'answers before the calibration answers (path participantId), items not served to this participant (path answers.N.itemId), invalid fields', example: 'Stage-2 answers arrived before the calibration answers.' },
          }),
        },
      },
      options: preflight('stage2AnswersPreflight'),
    },
    // Adaptive calibration (issue 17): the "next calibration item" step.
    '/api/v1/studies/{id}/calibration-next': {
      post: {
        operationId: 'nextCalibrationItem',
        summary: 'The next adaptive calibration item of a participant',
        description:
          'For a design version whose calibration is adaptive (adaptive design optimisation: each item is the candidate with the largest expected information ' +
          'about the participant\'s rates, given their answers so far). Step 0 sends no answer and returns the first item; step n sends the answer to the item ' +
          'step n − 1 returned and returns the next one, until `done` (the design\'s most items, or the posterior SD of ln k and ln K at its target). ' +
          'Answers are stored by the server; the same step sent again with the same answer returns the same reply and writes nothing, a different answer to ' +
          'a step already answered gives 409. When done, send `responses` to probe-items as the calibration responses. Estimates are posterior medians and ' +
          '95 % intervals from the participant\'s choices, not a clinical assessment. ' +
          corsNote,
        parameters: [id, token],
        requestBody: {
          required: true,
          content: {
            'application/json': {
              schema: {
                type: 'object',
                additionalProperties: false,
                required: ['participantId', 'step'],
                properties: {
                  participantId: { type: 'string', maxLength: 128, pattern: '^[\\w.:@-]+$' },
                  step: { type: 'integer', minimum: 0, maximum: 200, description: 'answers given so far, this one included' },
                  answer: {
                    type: 'object',
                    additionalProperties: false,
                    required: ['itemId', 'chosen'],
                    properties: { itemId: { type: 'string', maxLength: 64, description: 'the item the previous step returned' }, chosen: { type: 'string', enum: ['sooner', 'later'] } },
                  },
                },
              },
              example: { participantId: 'P-017', step: 1, answer: { itemId: 'acal-small-07-11', chosen: 'later' } },
            },
          },
        },
        responses: {
          '200': {
            description: 'the next item, or the end of calibration with the estimates',
            content: {
              'application/json': {
                schema: {
                  type: 'object',
                  required: ['participantId', 'designVersionId', 'step', 'answered', 'done', 'item', 'estimates', 'responses', 'caution'],
                  properties: {
                    participantId: { type: 'string' },
                    designVersionId: { type: 'integer' },
                    step: { type: 'integer' },
                    answered: { type: 'integer' },
                    done: { type: 'boolean' },
                    reason: { type: ['string', 'null'], enum: ['max-items', 'target-sd', 'no-candidates', null] },
                    item: { oneOf: [{ $ref: '#/components/schemas/Item' }, { type: 'null' }] },
                    information: { type: ['number', 'null'], description: 'expected information gain of the item, nats' },
                    estimates: { type: 'object', description: 'kSmall and kLarge: posterior median rate (per day), SD of ln k, 95 % interval; sensitivity: posterior median s or null' },
                    responses: { type: 'object', additionalProperties: { type: 'string', enum: ['sooner', 'later'] }, description: 'the answers so far as calibration responses for probe-items' },
                    caution: { type: 'string' },
                  },
                },
              },
            },
          },
          ...errorReplies(BODY_ENDPOINT_ERRORS, {
            '409': { description: 'the step was already answered differently, or the participant is calibrated with another design version', example: 'Step 1 of participant P-017 was already answered (acal-small-07-11: later); the first answer is kept.' },
            '422': { description: 'the design is not adaptive (path calibration), a step beyond the answers stored + 1 (step), an answer to another item than the one returned (answer.itemId), an answer after the end (answer)', example: 'Some fields are invalid.' },
          }),
        },
      },
      options: preflight('calibrationNextPreflight'),
    },
    // Real rewards (issue 20)
    '/api/v1/studies/{id}/payment-details': {
      post: {
        operationId: 'paymentDetails',
        summary: "Where a participant's reward link goes (studies with real rewards)",
        description:
          'An e-mail address for the reward link of a participant whose version pays real rewards (nothing more is kept; a second call replaces it). ' +
          'A payout held for want of it is scheduled; the reply carries the participant\'s reward once drawn. ' +
          corsNote,
        parameters: [id, token],
        requestBody: {
          required: true,
          content: {
            'application/json': {
              schema: { type: 'object', additionalProperties: false, required: ['participantId', 'email'], properties: { participantId: { type: 'string', maxLength: 128, pattern: '^[\\w.:@-]+$' }, email: { type: 'string', format: 'email', maxLength: 254 } } },
              example: { participantId: 'P-017', email: 'p017@harbourlight.example' },
            },
          },
        },
        responses: {
          '200': {
            description: 'stored',
            content: { 'application/json': { schema: { type: 'object', required: ['participantId', 'reward'], properties: { participantId: { type: 'string' }, reward: { oneOf: [{ $ref: '#/components/schemas/Reward' }, { type: 'null' }] } } } } },
          },
          ...errorReplies(['401', '403', '422', '429', '503'], {
            '422': { description: 'invalid fields (path email, participantId)', example: 'Some fields are invalid.' },
          }),
        },
      },
      options: preflight('paymentDetailsPreflight'),
    },
  };
}

/** Schemas the session paths refer to. */
export function sessionSchemas() {
  return {
    Reward: {
      type: 'object',
      description: 'Real rewards: the choice drawn (random incentive system) and what is paid when; present once the session completes, when the version pays real rewards.',
      required: ['itemId', 'chosen', 'amountMinor', 'amount', 'currency', 'dueDate', 'status', 'message'],
      properties: {
        itemId: { type: 'string' },
        chosen: { type: 'string', enum: ['sooner', 'later'] },
        amountMinor: { type: 'integer', description: 'whole minor units (cent, yen)' },
        amount: { type: 'string', description: 'the exact decimal amount, e.g. "37.50"' },
        currency: { type: 'string' },
        dueDate: { type: 'string', format: 'date' },
        status: { type: 'string', enum: ['scheduled', 'held', 'sending', 'sent', 'failed', 'cancelled'] },
        message: { type: 'string', description: 'a sentence for the participant' },
      },
    },
    Error: { type: 'object', required: ['error'], properties: { error: { type: 'string' }, issues: { type: 'array', items: { $ref: '#/components/schemas/Issue' } } } },
    CalibrationBlock: {
      type: 'object',
      required: ['participantId', 'designVersionId', 'designHash', 'itemBankId', 'presentation', 'order', 'items', 'caution'],
      properties: {
        participantId: { type: ['string', 'null'] },
        designVersionId: { type: 'integer' },
        designHash: { type: 'string' },
        itemBankId: { type: 'string', description: '16 hex digits naming the items (version and presentation settings); also in the export file header' },
        presentation: {
          type: 'object',
          properties: { seed: { type: 'integer' }, delayUnit: { type: 'string', enum: ['days', 'weeks', 'months'] }, minGap: { type: 'integer' }, amountUnit: { type: 'number' }, currency: { type: 'string' }, monthDays: { type: 'integer', const: 30 } },
        },
        order: { type: 'string', enum: ['bank', 'participant'] },
        items: { type: 'array', items: { $ref: '#/components/schemas/Item' } },
        sessionToken: { type: 'string', description: 'browser keys, once, when the call started the session; send it as X-Session-Token on every later call for this participant' },
        caution: { type: 'string' },
      },
    },
  };
}
