/**
 * The program version the pane writes into each run's analysis record. The build puts package.json's version in
 * place of __LONGIPANE_VERSION__ (webpack.config.js, DefinePlugin); code run without that build (unit tests) says
 * "development build".
 */
declare const __LONGIPANE_VERSION__: string | undefined;

export const PANE_VERSION: string =
  typeof __LONGIPANE_VERSION__ === 'string' ? __LONGIPANE_VERSION__ : 'development build';
