// Builds the Excel task pane (dist/taskpane.html) and the browser page (dist/index.html) from src/, and copies the
// manifest and icons. `npm start` serves dist over https://localhost:3000 with the Office development certificates.
// For a team: `npm run build -- --env publicUrl=https://host.example/longipane/` writes a manifest whose every address
// is under that address (the pages and assets use relative paths, so any path prefix works); without it the manifest
// keeps https://localhost:3000/ and the build says so. Either way the manifest's version is package.json's.
import { fileURLToPath } from 'node:url';
import { existsSync, readFileSync } from 'node:fs';
import { homedir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import webpack from 'webpack';
import HtmlWebpackPlugin from 'html-webpack-plugin';
import CopyWebpackPlugin from 'copy-webpack-plugin';
import MinimizerPlugin from 'minimizer-webpack-plugin';
import { DEV_URL, manifestFor, manifestVersion, normalisePublicUrl } from './scripts/manifestAddress.mjs';

const root = dirname(fileURLToPath(import.meta.url));
const PORT = 3000;
/** The version written into each run's analysis record (src/taskpane/version.ts). */
const VERSION = JSON.parse(readFileSync(join(root, 'package.json'), 'utf8')).version;

/**
 * HTTPS options from the Office development certificates (office-addin-dev-certs creates them in
 * ~/.office-addin-dev-certs and asks the system to trust its CA). Where the CA cannot be installed (Linux without
 * sudo, containers) but the files exist, they are used as they are and the message says to trust ca.crt by hand.
 * With no certificates at all, it says how to get them and stops.
 */
async function httpsOptions() {
  const dir = join(homedir(), '.office-addin-dev-certs');
  try {
    const devCerts = await import('office-addin-dev-certs');
    const getOptions = devCerts.getHttpsServerOptions ?? devCerts.default?.getHttpsServerOptions;
    return await getOptions();
  } catch (error) {
    const reason = error instanceof Error ? error.message.trim() : String(error);
    const files = ['ca.crt', 'localhost.crt', 'localhost.key'].map((f) => join(dir, f));
    if (files.every((f) => existsSync(f))) {
      process.stderr.write(
        `The development CA could not be installed (${reason}).\n` +
          `Serving with the certificates in ${dir}; trust ${files[0]} in your browser or system yourself.\n`,
      );
      const [ca, cert, key] = files.map((f) => readFileSync(f));
      return { ca, cert, key };
    }
    throw new Error(
      `Could not get the localhost development certificates (${reason}).\n` +
        'Install them once with: npx office-addin-dev-certs install\n' +
        '(on Linux, trust the created CA certificate in your browser yourself), then run npm start again.',
    );
  }
}

/** The address the manifest points at: `--env publicUrl=…` when given (checked), else the development server's. */
function publicUrlFrom(env) {
  const given = env?.publicUrl;
  if (given === undefined) return DEV_URL;
  if (typeof given !== 'string' || given.trim() === '') {
    throw new Error('--env publicUrl needs an address, like --env publicUrl=https://host.example/longipane/');
  }
  return normalisePublicUrl(given);
}

export default async (env, argv) => {
  const dev = argv.mode !== 'production';
  const serving = env?.WEBPACK_SERVE === true || process.env.WEBPACK_SERVE === 'true';
  const publicUrl = publicUrlFrom(env);
  const addinVersion = manifestVersion(VERSION);
  if (!serving) {
    process.stderr.write(
      publicUrl === DEV_URL
        ? `manifest.xml points at ${DEV_URL} (for side-loading with npm start on this computer). ` +
            'To build for a team, give the address dist/ will be served from: ' +
            'npm run build -- --env publicUrl=https://host.example/longipane/\n'
        : `manifest.xml points at ${publicUrl} (add-in version ${addinVersion}); serve dist/ there.\n`,
    );
  }
  return {
    context: root,
    entry: {
      taskpane: './src/excel/main.tsx',
      web: './src/web/main.tsx',
    },
    output: {
      path: resolve(root, 'dist'),
      filename: '[name].[contenthash:8].js',
      // Script addresses relative to the page, so dist/ works under any path prefix.
      publicPath: '',
      clean: true,
    },
    // Source maps only in development and inline (nothing points to another address); none in production.
    devtool: dev ? 'inline-source-map' : false,
    resolve: {
      extensions: ['.ts', '.tsx', '.js', '.mjs'],
    },
    module: {
      rules: [
        {
          test: /\.tsx?$/,
          exclude: /node_modules/,
          use: { loader: 'ts-loader', options: { transpileOnly: true, configFile: resolve(root, 'tsconfig.json') } },
        },
      ],
    },
    performance: { hints: false },
    // Production minification by esbuild (already a dev dependency for the command line) instead of terser: about
    // five times faster on these bundles, which keeps `npm test` (it builds) short. The pane and the page share one
    // chunk of library code (React, Fluent UI, the engine), so it is minified once and cached once by the browser.
    optimization: {
      minimizer: [new MinimizerPlugin({ minify: { implementation: MinimizerPlugin.esbuildMinify, options: { target: 'es2020' } } })],
      splitChunks: { chunks: 'all', name: 'shared', minChunks: 2 },
    },
    plugins: [
      new webpack.DefinePlugin({ __LONGIPANE_VERSION__: JSON.stringify(VERSION) }),
      new HtmlWebpackPlugin({
        filename: 'taskpane.html',
        template: './src/excel/taskpane.html',
        chunks: ['taskpane'],
      }),
      new HtmlWebpackPlugin({
        filename: 'index.html',
        template: './src/web/index.html',
        chunks: ['web'],
      }),
      new CopyWebpackPlugin({
        patterns: [
          {
            from: 'manifest.xml',
            to: 'manifest.xml',
            transform: (content) => manifestFor(content.toString('utf8'), { publicUrl, version: addinVersion }),
          },
          { from: 'assets', to: 'assets' },
        ],
      }),
    ],
    devServer: serving
      ? {
          port: PORT,
          static: false,
          headers: { 'Access-Control-Allow-Origin': '*' },
          server: { type: 'https', options: await httpsOptions() },
          client: { overlay: { errors: true, warnings: false } },
        }
      : undefined,
  };
};
