/**
 * The caution every per-person output carries where it leaves the app (CSV exports, API replies):
 * rates and patterns are estimates from hypothetical choices, never a judgement of the person.
 */
export const PERSON_CAUTION =
  'Estimates from hypothetical choices in this study, not a clinical assessment of any person and not a diagnostic test; follow your ethics board on how they may be used.';
