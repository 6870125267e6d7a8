/**
 * Worker thread of the HTML report (src/report/report-thread.ts): draws the report's pictures and
 * writes report.html's text from the plot source it is given, posts the text (or the error) on
 * its port, and then raises the shared flag, whatever happened, so the waiting thread never waits
 * for a message that will not come. The drawing modules are loaded inside the try, so that a
 * failure to load them is reported like any other.
 */
import { workerData, type MessagePort } from 'node:worker_threads';
import type { PlotSource } from './saved.js';

const { src, flag, port } = workerData as { src: PlotSource; flag: Int32Array; port: MessagePort };
// running (2): the waiting thread now waits for the end rather than the start
Atomics.store(flag, 0, 2);
Atomics.notify(flag, 0);
try {
  const [{ reportPictures }, { reportHtml }] = await Promise.all([import('./report-pictures.js'), import('./html.js')]);
  port.postMessage({ html: reportHtml(src, reportPictures(src)) });
} catch (err) {
  port.postMessage({ error: err instanceof Error ? (err.stack ?? err.message) : String(err) });
} finally {
  // done (1), after the message is posted
  Atomics.store(flag, 0, 1);
  Atomics.notify(flag, 0);
}
