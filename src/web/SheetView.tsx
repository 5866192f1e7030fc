/** One result sheet on the page: its title, then its paragraphs, tables and charts in order. */
import type { ReactNode } from 'react';
import { memo } from 'react';
import type { ChartSpec, SheetSpec } from '../core/report/types';
import { ChartView } from './ChartView';
import { sheetDomId } from './resultStore';
import { TableView } from './TableView';

/** 'percent' when the chart's numbers sit in a percentage column of its source table (matched by series name). */
export function yAxisOf(chart: ChartSpec, sheet: SheetSpec): 'plain' | 'percent' {
  const table = sheet.blocks.find((b) => b.kind === 'table' && b.id === chart.sourceTable);
  if (table === undefined || table.kind !== 'table') return 'plain';
  const names = new Set(chart.series.map((s) => s.name));
  const columns = table.columns.filter((c) => names.has(c.header));
  return columns.length > 0 && columns.every((c) => c.format === 'percent1') ? 'percent' : 'plain';
}

export interface SheetViewProps {
  readonly name: string;
  readonly spec: SheetSpec;
  /** Per block, the table's full row count where `spec` holds only its first rows (pageView.ts). */
  readonly tableRows?: readonly (number | null)[];
  /** Only the section and its title, the blocks to follow (ResultsView draws the sheets one per task). */
  readonly titleOnly?: boolean;
}

export const SheetView = memo(function SheetView({ name, spec, tableRows, titleOnly = false }: SheetViewProps): ReactNode {
  return (
    <section className="sheet" id={sheetDomId(name)} aria-labelledby={`${sheetDomId(name)}-title`}>
      <h2 id={`${sheetDomId(name)}-title`} tabIndex={-1}>
        {spec.title}
        <span className="sheet-name"> (sheet “{name}”)</span>
      </h2>
      {titleOnly && <p className="small">Drawing this sheet…</p>}
      {!titleOnly && spec.blocks.map((block, i) => {
        if (block.kind === 'paragraph') {
          if (block.style === 'heading') return <h3 key={i}>{block.text}</h3>;
          return (
            <p key={i} className={block.style === 'caution' ? 'caution' : undefined}>
              {block.text}
            </p>
          );
        }
        if (block.kind === 'table') {
          const total = tableRows?.[i];
          return <TableView key={i} table={block} {...(typeof total === 'number' ? { totalRows: total } : {})} />;
        }
        return <ChartView key={i} chart={block.chart} yAxis={yAxisOf(block.chart, spec)} />;
      })}
    </section>
  );
});
