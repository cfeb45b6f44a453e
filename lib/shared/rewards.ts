/**
 * The caution shown with real rewards: on the payouts page, in the ledger's API reply and as the
 * first line of its CSV export.
 */
export const REWARD_CAUTION =
  'Real rewards must follow the payment and deception rules your ethics board approved; Switchback records the draw and the payments but does not approve them. What a participant is paid follows from one randomly drawn choice: it is not an assessment of the participant.';
