import { Notice } from '@/components/ui/notice';

/** The caution every power page shows. */
export function PowerCaution() {
  return (
    <Notice tone="info">
      Power figures are estimates from simulated hypothetical choices under the assumptions listed in the method text, not a clinical assessment of any
      person. Studies with real rewards follow the local ethics board&apos;s rules on payments and deception.
    </Notice>
  );
}
