/** The GEE engine (Liang & Zeger 1986; Mancl & DeRouen 2001). */
export { fitGee, SMALL_SAMPLE_PARTICIPANTS } from './fitGee';
export type * from './types';
