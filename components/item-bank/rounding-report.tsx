import { Notice } from '@/components/ui/notice';
import { Table, Td, Th } from '@/components/ui/table';
import type { ItemBankPreviewDto } from '@/lib/client/item-bank';

const days = (v: number) => (Number.isInteger(v) ? String(v) : v.toFixed(1));

/** What rounding did to each pair's predicted pattern (at the prior medians) and to the calibration tie rates. */
export function RoundingReport({ report }: { report: ItemBankPreviewDto['rounding'] }) {
  return (
    <div className="space-y-3" data-testid="rounding-report">
      {report.patternsPreserved ? (
        <Notice tone="info" title="Rounding keeps every predicted pattern">
          Amounts rounded to {report.amountUnit}, delays to whole {report.delayUnit}: each pair still shows the pattern its exact numbers predict at the prior medians.
        </Notice>
      ) : (
        <Notice tone="warning" title="Rounding changes a predicted pattern">
          At least one pair shows a different pattern after rounding (marked below). Try rounding delays to days instead of weeks or months.
        </Notice>
      )}
      <Table caption="Rounding effect per pair">
        <thead className="bg-paper-sunk">
          <tr>
            <Th>Pair</Th>
            <Th>Meant to show</Th>
            <Th>Exact late delay</Th>
            <Th>Rounded</Th>
            <Th>Pattern exact → rounded</Th>
          </tr>
        </thead>
        <tbody className="divide-y divide-ink/10">
          {report.pairs.map((p) => (
            <tr key={p.pairId} className={p.changed ? 'bg-amber-50' : ''}>
              <Td className="font-mono text-xs">{p.pairId}</Td>
              <Td>{p.expected}</Td>
              <Td className="tabular-nums">{days(p.exact.lateDelay)} days</Td>
              <Td className="tabular-nums">{p.rounded.lateDelay} days</Td>
              <Td>
                {p.exact.pattern} → {p.rounded.pattern}
                {p.changed ? ' (changed)' : ''}
              </Td>
            </tr>
          ))}
        </tbody>
      </Table>
      <p className="text-xs text-ink-soft">
        Calibration block: rounding delays moved an item&apos;s indifference rate by at most {(report.calibration.largestRelativeRateChange * 100).toFixed(1)} %
        {report.calibration.itemId ? ` (${report.calibration.itemId})` : ''}.
      </p>
    </div>
  );
}
