/// <reference lib="webworker" />
import type { ToWorker } from './protocol.ts';
import { dspJobServer } from './jobServer.ts';

const serve = dspJobServer((message, transfer) => self.postMessage(message, transfer));

self.addEventListener('message', (event: MessageEvent<ToWorker>) => serve(event.data));
