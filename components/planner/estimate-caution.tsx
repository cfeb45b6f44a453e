import { Notice } from '@/components/ui/notice';

/** The caution shown wherever planner numbers describe people. */
export function EstimateCaution() {
  return (
    <Notice tone="info" title="These are planning estimates">
      Rates and shares here describe hypothetical choices expected from a sample under the priors you set; they are not a clinical assessment of
      anyone, and discount rates are not a diagnostic test. Studies with real rewards follow the rules of your ethics board for payments and deception.
    </Notice>
  );
}
