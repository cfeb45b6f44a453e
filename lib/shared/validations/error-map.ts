import { z } from 'zod';

/**
 * One voice for validation messages. Every schema in lib/shared/validations gives its own
 * sentence where it has one; this map writes the rest (the library's defaults read like
 * "Too small: expected number to be >=0") as a sentence that names the field. The same map
 * runs in the browser (forms) and on the server (422 replies), because every schema module
 * imports this one, which installs it into zod's global configuration.
 */

/** Names of fields as a user reads them, by the last key of the issue's path. */
export const FIELD_LABELS: Record<string, string> = {
  name: 'The name',
  email: 'The e-mail address',
  password: 'The password',
  currentPassword: 'The current password',
  newPassword: 'The new password',
  role: 'The role',
  token: 'The link',
  version: 'The version',
  description: 'The description',
  notes: 'The notes',
  medianSmall: 'The median rate for the small reward',
  medianLarge: 'The median rate for the large reward',
  sdLogSmall: 'The spread (SD of ln k) for the small reward',
  sdLogLarge: 'The spread (SD of ln K) for the large reward',
  correlation: 'The correlation',
  priorSetId: 'The prior set',
  model: 'The model',
  id: 'The choice',
  sensitivity: 'The delay sensitivity s',
  presentBias: 'The present bias β',
  choiceSensitivity: 'The choice sensitivity γ',
  ratio: 'The magnitude ratio S/L',
  largeAmount: 'The large amount L',
  currency: 'The currency',
  mode: 'The design type',
  soonDelay: 'The soon delay',
  days: 'The soon delay d',
  min: 'The shortest soon delay',
  max: 'The longest soon delay',
  lateDelayLimit: 'The late-delay limit',
  probePairs: 'The number of reversal probes',
  lateAnchors: 'The number of late anchors',
  soonAnchors: 'The number of soon anchors',
  criterion: 'The criterion',
  itemsPerMagnitude: 'The number of calibration items per magnitude',
  minDelay: 'The shortest calibration delay',
  maxDelay: 'The longest calibration delay',
  designVersionId: 'The frozen design version',
  participantId: 'The participant id',
  responses: 'The responses',
  replications: 'The number of replications',
  sampleSizes: 'The sample sizes',
  seed: 'The seed',
  alpha: 'The significance level α',
  gamma: 'The choice sensitivity γ',
  lapse: 'The lapse rate ε',
  test: 'The test',
  kind: 'The kind',
  label: 'The label',
  origins: 'The allowed origins',
  format: 'The format',
  csv: 'The file',
  delayUnit: 'The delay unit',
  minGap: 'The smallest gap',
};

/** The field an issue is about, as a sentence subject: a known label, else the key in words. */
export function fieldLabel(path: ReadonlyArray<PropertyKey>): string {
  const keys = path.filter((k): k is string => typeof k === 'string');
  const last = keys[keys.length - 1];
  if (last === undefined) {
    const index = path[path.length - 1];
    return typeof index === 'number' ? `Entry ${index + 1}` : 'The value';
  }
  if (FIELD_LABELS[last]) return FIELD_LABELS[last];
  const words = last
    .replace(/([a-z0-9])([A-Z])/g, '$1 $2')
    .replace(/[_-]+/g, ' ')
    .toLowerCase();
  return `The field “${words}”`;
}

const TYPE_WORDS: Record<string, string> = {
  number: 'a number',
  int: 'a whole number',
  string: 'text',
  boolean: 'true or false',
  array: 'a list',
  object: 'a group of fields',
  date: 'a date',
  bigint: 'a whole number',
};

function bound(value: unknown): string {
  return typeof value === 'number' || typeof value === 'bigint' ? value.toString().replace('-', '−') : String(value);
}

function quoteList(values: ReadonlyArray<unknown>): string {
  return values.map((v) => (typeof v === 'string' ? `“${v}”` : String(v))).join(', ');
}

type Issue = Parameters<z.core.$ZodErrorMap>[0];

/** The message for one issue the schema did not word itself. */
export function friendlyMessage(issue: Issue): string {
  const field = fieldLabel(issue.path ?? []);
  switch (issue.code) {
    case 'invalid_type': {
      if (issue.input === undefined || issue.input === null || issue.input === '') return `${field} is required.`;
      return `${field} must be ${TYPE_WORDS[issue.expected] ?? issue.expected}.`;
    }
    case 'too_small': {
      const min = bound(issue.minimum);
      if (issue.origin === 'string') return Number(issue.minimum) <= 1 ? `${field} cannot be empty.` : `${field} must be at least ${min} characters long.`;
      if (issue.origin === 'array' || issue.origin === 'set') return `${field} needs at least ${min} ${Number(issue.minimum) === 1 ? 'entry' : 'entries'}.`;
      return issue.inclusive ? `${field} must be ${min} or more.` : `${field} must be above ${min}.`;
    }
    case 'too_big': {
      const max = bound(issue.maximum);
      if (issue.origin === 'string') return `${field} must be at most ${max} characters long.`;
      if (issue.origin === 'array' || issue.origin === 'set') return `${field} takes at most ${max} ${Number(issue.maximum) === 1 ? 'entry' : 'entries'}.`;
      return issue.inclusive ? `${field} must be at most ${max}.` : `${field} must be below ${max}.`;
    }
    case 'invalid_value':
      return issue.values.length === 1 ? `${field} must be ${quoteList(issue.values)}.` : `${field} must be one of ${quoteList(issue.values)}.`;
    case 'invalid_format':
      if (issue.format === 'email') return `${field} is not a valid e-mail address.`;
      if (issue.format === 'url') return `${field} is not a valid web address.`;
      if (issue.format === 'regex') return `${field} is not in the expected form.`;
      return `${field} is not a valid ${issue.format}.`;
    case 'not_multiple_of':
      return `${field} must be a multiple of ${bound(issue.divisor)}.`;
    case 'unrecognized_keys':
      return `${issue.keys.length === 1 ? 'This field is' : 'These fields are'} not accepted here: ${issue.keys.join(', ')}.`;
    case 'invalid_union':
      return `${field} does not match any of the accepted forms.`;
    case 'invalid_key':
      return `${field} has a key that is not accepted.`;
    case 'invalid_element':
      return `${field} has an entry that is not accepted.`;
    default:
      return `${field} is not valid.`;
  }
}

z.config({ customError: (issue) => friendlyMessage(issue) });
