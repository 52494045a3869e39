// Webpack build of the Ratchet add-in.
//   npm run build       production bundle in dist/ (offline: no network, no certificates)
//   npm run dev-server  https://localhost:3000 with the Office dev certificates (office-addin-dev-certs)
//   npm run build -- --env origin=https://addins.example.org   (or RATCHET_ORIGIN=…): a build for
//                       that origin — dist/manifest.xml, functions.json and the scripts carry it
// Outputs: functions.js (custom functions; its JSDoc becomes functions.json through
// custom-functions-metadata-plugin, which also adds the CustomFunctions.associate calls),
// taskpane.js + taskpane.html (the shared-runtime page that loads both bundles), the worker chunk
// (from `new Worker(new URL('./worker.ts', import.meta.url))`), assets/ icons and manifest.xml.
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { createRequire } from 'node:module';
import HtmlWebpackPlugin from 'html-webpack-plugin';
import CopyWebpackPlugin from 'copy-webpack-plugin';
import { renderHelpPage } from './scripts/help-page.mjs';
import { DEV_ORIGIN, ORIGIN_ASSETS, REQUIRED_ORIGIN_ASSETS, originSetting, substituteOrigin } from './scripts/origin.mjs';

const require = createRequire(import.meta.url);
const CustomFunctionsMetadataPlugin = require('custom-functions-metadata-plugin');
const here = path.dirname(fileURLToPath(import.meta.url));
const port = Number(process.env.npm_package_config_dev_server_port || 3000);

async function httpsOptions() {
  const devCerts = require('office-addin-dev-certs');
  return devCerts.getHttpsServerOptions();
}

export default async (env, options) => {
  const dev = options.mode !== 'production';
  const serve = Boolean(env && env.WEBPACK_SERVE);
  const origin = serve ? undefined : originSetting(env, process.env);
  return {
    mode: dev ? 'development' : 'production',
    devtool: dev ? 'source-map' : false,
    context: here,
    entry: {
      functions: './src/functions/functions.ts',
      taskpane: './taskpane/taskpane.ts',
      // Browser preview (npm run preview): the same pane without Office; never loads office.js.
      preview: './taskpane/preview.ts',
    },
    output: {
      path: path.resolve(here, 'dist'),
      filename: '[name].js',
      chunkFilename: '[name].[contenthash:8].js',
      clean: true,
    },
    resolve: {
      extensions: ['.ts', '.js'],
      // Sources import './x.js' (ESM style); resolve that to the .ts file.
      extensionAlias: { '.js': ['.ts', '.js'] },
    },
    module: {
      rules: [
        {
          test: /\.ts$/,
          exclude: /node_modules/,
          use: { loader: 'ts-loader', options: { configFile: path.resolve(here, 'tsconfig.json'), onlyCompileBundledFiles: true, transpileOnly: false, compilerOptions: { noEmit: false } } },
        },
      ],
    },
    plugins: [
      // help.html: the README rendered with heading anchors; every function's help link lands on its section.
      {
        apply(compiler) {
          compiler.hooks.thisCompilation.tap('RatchetHelpPage', (compilation) => {
            const readme = path.resolve(here, 'README.md');
            compilation.fileDependencies.add(readme);
            compilation.hooks.processAssets.tap({ name: 'RatchetHelpPage', stage: compiler.webpack.Compilation.PROCESS_ASSETS_STAGE_ADDITIONAL }, () => {
              compilation.emitAsset('help.html', new compiler.webpack.sources.RawSource(renderHelpPage(readme)));
            });
          });
        },
      },
      // A deployment build: the dev origin in the emitted manifest, metadata and scripts becomes
      // the chosen origin (after minification, so string literals are final).
      {
        apply(compiler) {
          if (origin === undefined) return;
          compiler.hooks.thisCompilation.tap('RatchetOrigin', (compilation) => {
            compilation.hooks.processAssets.tap({ name: 'RatchetOrigin', stage: compiler.webpack.Compilation.PROCESS_ASSETS_STAGE_OPTIMIZE_INLINE }, (assets) => {
              const changed = new Set();
              for (const name of Object.keys(assets)) {
                if (!ORIGIN_ASSETS.test(name)) continue;
                const text = assets[name].source().toString();
                if (!text.includes(DEV_ORIGIN)) continue;
                compilation.updateAsset(name, new compiler.webpack.sources.RawSource(substituteOrigin(text, origin)));
                changed.add(name);
              }
              for (const name of REQUIRED_ORIGIN_ASSETS) {
                if (!changed.has(name)) compilation.errors.push(new compiler.webpack.WebpackError(`origin ${origin}: ${name} was not emitted with the dev origin ${DEV_ORIGIN} to replace.`));
              }
            });
          });
        },
      },
      new CustomFunctionsMetadataPlugin({ output: 'functions.json', input: './src/functions/functions.ts' }),
      // The pane loads office.js only when hosted in Office, then imports the functions module itself
      // (CustomFunctions.associate needs office.js first), so the page carries the taskpane chunk only.
      new HtmlWebpackPlugin({ filename: 'taskpane.html', template: './taskpane/taskpane.html', chunks: ['taskpane'], scriptLoading: 'defer', inject: 'body' }),
      new HtmlWebpackPlugin({ filename: 'preview.html', template: './taskpane/taskpane.html', chunks: ['preview'], scriptLoading: 'defer', inject: 'body', ratchetMode: 'preview' }),
      new CopyWebpackPlugin({
        patterns: [
          { from: 'assets/*.png', to: 'assets/[name][ext]' },
          { from: 'manifest.xml', to: 'manifest.xml' },
          { from: 'taskpane/taskpane.css', to: 'taskpane.css' },
          // The preview's .xlsx reader: exceljs's own minified browser build, served as is (not re-bundled).
          { from: 'node_modules/exceljs/dist/exceljs.min.js', to: 'vendor/exceljs.min.js', info: { minimized: true } },
        ],
      }),
    ],
    // One webpack runtime for both entries: the functions and the pane run in one page (the shared
    // runtime), so they must share module instances — one registry, one result cache.
    optimization: { runtimeChunk: 'single', splitChunks: { chunks: 'initial', name: 'shared', minSize: 0 } },
    performance: { hints: false },
    devServer: serve
      ? {
          port,
          hot: false,
          headers: { 'Access-Control-Allow-Origin': '*' },
          server: { type: 'https', options: await httpsOptions() },
          static: { directory: path.resolve(here, 'dist') },
        }
      : undefined,
  };
};
