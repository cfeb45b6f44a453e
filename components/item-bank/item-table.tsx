import { Table, Td, Th } from '@/components/ui/table';
import type { BankItem } from '@/lib/design';

const ROLE_LABELS: Record<BankItem['role'], string> = {
  calibration: 'Calibration',
  'reversal-probe': 'Reversal probe',
  'late-anchor': 'Late anchor',
  'soon-anchor': 'Soon anchor',
  'attention-check': 'Attention check',
};

/** Items in presentation order: position, id, role, view, the two options and the wording. */
export function ItemTable({ items, caption }: { items: BankItem[]; caption: string }) {
  return (
    <Table caption={caption}>
      <thead className="bg-paper-sunk">
        <tr>
          <Th>#</Th>
          <Th>Item</Th>
          <Th>Role</Th>
          <Th>View</Th>
          <Th>Sooner</Th>
          <Th>Later</Th>
          <Th>Sooner on</Th>
          <Th>Text</Th>
        </tr>
      </thead>
      <tbody className="divide-y divide-ink/10">
        {items.map((item) => (
          <tr key={`${item.block}-${item.id}`} data-testid="item-row">
            <Td className="tabular-nums">{item.position}</Td>
            <Td className="font-mono text-xs">{item.id}</Td>
            <Td>{ROLE_LABELS[item.role]}</Td>
            <Td>{item.view ?? '—'}</Td>
            <Td className="tabular-nums">
              {item.soonerAmount} · day {item.soonerDelay}
            </Td>
            <Td className="tabular-nums">
              {item.laterAmount} · day {item.laterDelay}
            </Td>
            <Td>{item.soonerSide}</Td>
            <Td className="text-ink-soft">{item.text}</Td>
          </tr>
        ))}
      </tbody>
    </Table>
  );
}
