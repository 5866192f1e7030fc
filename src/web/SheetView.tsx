/** One result sheet on the page: its title, then its paragraphs, tables and charts in order. */
import type { ReactNode } from 'react';
import type { SheetSpec } from '../core/report/types';
import { ChartView } from './ChartView';
import { sheetDomId } from './resultStore';
import { TableView } from './TableView';

export function SheetView({ name, spec }: { readonly name: string; readonly spec: SheetSpec }): ReactNode {
  return (
    <section className="sheet" id={sheetDomId(name)} aria-labelledby={`${sheetDomId(name)}-title`}>
      <h2 id={`${sheetDomId(name)}-title`} tabIndex={-1}>
        {spec.title}
        <span className="sheet-name"> (sheet “{name}”)</span>
      </h2>
      {spec.blocks.map((block, i) => {
        if (block.kind === 'paragraph') {
          if (block.style === 'heading') return <h3 key={i}>{block.text}</h3>;
          return (
            <p key={i} className={block.style === 'caution' ? 'caution' : undefined}>
              {block.text}
            </p>
          );
        }
        if (block.kind === 'table') return <TableView key={i} table={block} />;
        return <ChartView key={i} chart={block.chart} />;
      })}
    </section>
  );
}
