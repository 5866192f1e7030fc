export { App, type AppProps } from './App';
export type { PaneActions, DataSource, ScheduleSource, ScheduleLoad, SavedSettings, WrittenSheet } from './actions';
export { CORE_ENGINE, type PaneEngine } from './engine';
