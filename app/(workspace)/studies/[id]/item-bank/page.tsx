import type { Metadata } from 'next';
import { ItemBankPage } from '@/components/item-bank/item-bank-page';

export const metadata: Metadata = { title: 'Item bank' };

export default function StudyItemBankPage() {
  return <ItemBankPage />;
}
