/**
 * Start a worker thread on a TypeScript module: registers tsx in the thread, then imports
 * `workerData.entry` (an absolute path). `new Worker(thisFile, { workerData: { entry, ... } })`.
 */
import { register } from 'tsx/esm/api';
import { workerData } from 'node:worker_threads';
import { pathToFileURL } from 'node:url';

register();
await import(pathToFileURL(workerData.entry).href);
