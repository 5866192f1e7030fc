export {
  createWebActions,
  readDataFile,
  splitAddress,
  baseName,
  scheduleMessage,
  STARTER_NAME,
  type WebActions,
} from './webActions';
export { ResultStore, sheetDomId, type PageState, type HighlightedCell } from './resultStore';
export { Page } from './Page';
export { ChartView } from './ChartView';
export { niceTicks, niceStep, linearScale, extent, tickLabel } from './chartScale';
