/**
 * The XML of one native chart part (DrawingML charts, ECMA-376 Part 1 §21.2): a clustered column, line or scatter
 * chart whose series read the sheet's cells through references such as 'Visit timing'!$B$12:$B$16, with cached copies
 * of the values for readers that show a chart before they recalculate. Element order follows the schema's sequences
 * (CT_Chart, CT_BarSer, CT_LineSer, CT_ScatterSer, CT_CatAx, CT_ValAx). Pure; cost O(points).
 */
import { columnLetters } from '../core/intake/cellAddress';
import type { ChartSpec } from '../core/report/types';
import type { BoundSeries, CellRun } from './bindChart';

export const CHART_NS = 'http://schemas.openxmlformats.org/drawingml/2006/chart';
export const DRAWING_NS = 'http://schemas.openxmlformats.org/drawingml/2006/main';
export const REL_NS = 'http://schemas.openxmlformats.org/officeDocument/2006/relationships';

/** Series colours (our own choice: distinguishable hues of similar weight); an interval takes its series' colour. */
const PALETTE = ['1F5A96', 'C0504D', '4E8F3A', '7A4FA0', 'D08A1E', '2A9D9A', '8C6D4F', '5F6B7A'];

/** Text escaped for XML character data and attribute values. */
export function xmlText(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&apos;');
}

/** An absolute reference to a run of cells with the sheet name always quoted: 'Visit timing'!$B$12:$B$16. */
export function runReference(sheet: string, r: CellRun): string {
  const c = columnLetters(r.column);
  return `'${sheet.replace(/'/g, "''")}'!$${c}$${r.first}:$${c}$${r.last}`;
}

function rich(text: string, vertical: boolean, bold = false): string {
  const body = vertical ? '<a:bodyPr rot="-5400000" vert="horz"/>' : '<a:bodyPr/>';
  return `<c:title><c:tx><c:rich>${body}<a:p><a:pPr><a:defRPr b="0"/></a:pPr><a:r><a:rPr lang="en-GB" b="${bold ? 1 : 0}"/><a:t>${xmlText(text)}</a:t></a:r></a:p></c:rich></c:tx><c:overlay val="0"/></c:title>`;
}

function strRef(ref: string, values: readonly (string | number | null)[]): string {
  const pts = values.map((v, i) => (v === null ? '' : `<c:pt idx="${i}"><c:v>${xmlText(String(v))}</c:v></c:pt>`)).join('');
  return `<c:strRef><c:f>${xmlText(ref)}</c:f><c:strCache><c:ptCount val="${values.length}"/>${pts}</c:strCache></c:strRef>`;
}

function numRef(ref: string, values: readonly (string | number | null)[]): string {
  const pts = values.map((v, i) => (typeof v === 'number' && Number.isFinite(v) ? `<c:pt idx="${i}"><c:v>${v}</c:v></c:pt>` : '')).join('');
  return `<c:numRef><c:f>${xmlText(ref)}</c:f><c:numCache><c:formatCode>General</c:formatCode><c:ptCount val="${values.length}"/>${pts}</c:numCache></c:numRef>`;
}

/** Line and fill of one series: bars filled; lines solid or dashed; markers-only series without a line. */
function shape(kind: ChartSpec['kind'], s: BoundSeries, colour: string): string {
  const fill = `<a:solidFill><a:srgbClr val="${colour}"/></a:solidFill>`;
  if (kind === 'bar') return `<c:spPr>${fill}</c:spPr>`;
  if (s.markersOnly) return '<c:spPr><a:ln w="28575"><a:noFill/></a:ln></c:spPr>';
  const dash = s.dashed ? '<a:prstDash val="dash"/>' : '';
  return `<c:spPr><a:ln w="${s.dashed ? 15875 : 25400}" cap="rnd">${fill}${dash}</a:ln></c:spPr>`;
}

function marker(s: BoundSeries, colour: string): string {
  if (!s.markersOnly) return '<c:marker><c:symbol val="none"/></c:marker>';
  const fill = `<a:solidFill><a:srgbClr val="${colour}"/></a:solidFill>`;
  return `<c:marker><c:symbol val="circle"/><c:size val="7"/><c:spPr>${fill}<a:ln>${fill}</a:ln></c:spPr></c:marker>`;
}

function seriesXml(chart: ChartSpec, sheet: string, s: BoundSeries, k: number, colour: string): string {
  const head = `<c:idx val="${k}"/><c:order val="${k}"/><c:tx><c:v>${xmlText(s.name)}</c:v></c:tx>${shape(chart.kind, s, colour)}`;
  const x = runReference(sheet, s.x);
  const y = numRef(runReference(sheet, s.y), s.yValues);
  if (chart.kind === 'scatter') return `<c:ser>${head}${marker(s, colour)}<c:xVal>${numRef(x, s.xValues)}</c:xVal><c:yVal>${y}</c:yVal><c:smooth val="0"/></c:ser>`;
  const cat = `<c:cat>${strRef(x, s.xValues)}</c:cat><c:val>${y}</c:val>`;
  if (chart.kind === 'bar') return `<c:ser>${head}<c:invertIfNegative val="0"/>${cat}</c:ser>`;
  return `<c:ser>${head}${marker(s, colour)}${cat}<c:smooth val="0"/></c:ser>`;
}

const X_AXIS = 500001;
const Y_AXIS = 500002;

function axes(chart: ChartSpec): string {
  const common = (id: number, pos: string, title: string, vertical: boolean, cross: number): string =>
    `<c:axId val="${id}"/><c:scaling><c:orientation val="minMax"/></c:scaling><c:delete val="0"/><c:axPos val="${pos}"/>` +
    (vertical ? '<c:majorGridlines><c:spPr><a:ln w="6350"><a:solidFill><a:srgbClr val="D9D9D9"/></a:solidFill></a:ln></c:spPr></c:majorGridlines>' : '') +
    `${rich(title, vertical)}<c:numFmt formatCode="General" sourceLinked="1"/><c:majorTickMark val="out"/><c:minorTickMark val="none"/><c:tickLblPos val="low"/>` +
    // A scatter chart's axes meet at the lower-left corner, not at zero (study days start before day 0).
    `<c:crossAx val="${cross}"/><c:crosses val="${chart.kind === 'scatter' ? 'min' : 'autoZero'}"/>`;
  const y = `<c:valAx>${common(Y_AXIS, 'l', chart.yLabel, true, X_AXIS)}<c:crossBetween val="${chart.kind === 'scatter' ? 'midCat' : 'between'}"/></c:valAx>`;
  if (chart.kind === 'scatter') return `<c:valAx>${common(X_AXIS, 'b', chart.xLabel, false, Y_AXIS)}<c:crossBetween val="midCat"/></c:valAx>${y}`;
  return `<c:catAx>${common(X_AXIS, 'b', chart.xLabel, false, Y_AXIS)}<c:auto val="1"/><c:lblAlgn val="ctr"/><c:lblOffset val="100"/><c:noMultiLvlLbl val="0"/></c:catAx>${y}`;
}

/**
 * The chart part for `chart`, its series bound to cells of sheet `sheet`. Interval bounds take the colour of the
 * series they belong to (the series listed just before them).
 * Example: chartXml(bar chart "On-time rate by site", 'Visit timing', one series over B12:B16) → a c:chartSpace with
 * one c:barChart series whose c:val reads 'Visit timing'!$I$12:$I$16.
 */
export function chartXml(chart: ChartSpec, sheet: string, series: readonly BoundSeries[]): string {
  let colour = -1;
  const sers = series
    .map((s, k) => {
      if (!s.dashed) colour += 1;
      return seriesXml(chart, sheet, s, k, PALETTE[Math.max(0, colour) % PALETTE.length]!);
    })
    .join('');
  const axisIds = `<c:axId val="${X_AXIS}"/><c:axId val="${Y_AXIS}"/>`;
  const plot =
    chart.kind === 'bar'
      ? `<c:barChart><c:barDir val="col"/><c:grouping val="clustered"/><c:varyColors val="0"/>${sers}<c:gapWidth val="80"/>${axisIds}</c:barChart>`
      : chart.kind === 'line'
        ? `<c:lineChart><c:grouping val="standard"/><c:varyColors val="0"/>${sers}<c:marker val="1"/>${axisIds}</c:lineChart>`
        : `<c:scatterChart><c:scatterStyle val="lineMarker"/><c:varyColors val="0"/>${sers}${axisIds}</c:scatterChart>`;
  return (
    '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n' +
    `<c:chartSpace xmlns:c="${CHART_NS}" xmlns:a="${DRAWING_NS}" xmlns:r="${REL_NS}">` +
    '<c:roundedCorners val="0"/>' +
    `<c:chart>${rich(chart.title, false, true)}<c:autoTitleDeleted val="0"/><c:plotArea><c:layout/>${plot}${axes(chart)}</c:plotArea>` +
    '<c:legend><c:legendPos val="b"/><c:overlay val="0"/></c:legend><c:plotVisOnly val="1"/><c:dispBlanksAs val="gap"/></c:chart>' +
    '<c:spPr><a:solidFill><a:srgbClr val="FFFFFF"/></a:solidFill><a:ln w="6350"><a:solidFill><a:srgbClr val="BFBFBF"/></a:solidFill></a:ln></c:spPr>' +
    '</c:chartSpace>'
  );
}
