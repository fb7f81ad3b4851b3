/**
 * Bundles the worker-thread entries into plain CommonJS files under
 * .haulcase/ (run before `next build` and `next dev`). A worker needs a file
 * Node can start as it is; Next's server bundle rewrites module paths, so the
 * worker is built on its own, with esbuild (installed with tsx).
 */
import { buildWorkbookWorker } from '../lib/export/build-workbook-worker';
import { buildMonteCarloWorker } from '../lib/risk/build-worker';
import { buildBreakEvenWorker } from '../lib/sensitivity/build-break-even-worker';

Promise.all([buildMonteCarloWorker(), buildBreakEvenWorker(), buildWorkbookWorker()])
  .then((files) => files.forEach((file) => console.log(`worker bundle: ${file}`)))
  .catch((err) => {
    console.error(err);
    process.exit(1);
  });
