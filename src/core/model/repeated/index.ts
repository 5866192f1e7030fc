/** The repeated-measures model with an unstructured covariance across scheduled visits. */
export { fitRepeated } from './fit';
export type * from './types';
