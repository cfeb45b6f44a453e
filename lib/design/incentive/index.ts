// The random incentive system: which of a participant's choices is paid, how much (minor units) and when.
export { eligibleChoices, INCENTIVE_BLOCKS, type AnsweredItem, type IncentiveBlocks, type OfferedItem } from './eligibleChoices';
export { drawIncentive, addDays, type IncentiveDraw } from './drawIncentive';
export { currencyDigits, formatMinorUnits, toMinorUnits } from './minorUnits';
