/**
 * Bad calibration responses or presentation options: every problem at once, each naming the
 * item or field, so the API can answer 422 with the full list.
 *
 * @example new ItemBankInputError([{ path: 'responses.cal-small-01', message: 'missing' }]).issues.length // 1
 */
export class ItemBankInputError extends Error {
  readonly issues: Array<{ path: string; message: string }>;

  constructor(issues: Array<{ path: string; message: string }>) {
    super(`Invalid input: ${issues.map((i) => `${i.path} (${i.message})`).join('; ')}`);
    this.name = 'ItemBankInputError';
    this.issues = issues;
  }
}
