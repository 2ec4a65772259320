// Worker entry: registers tsx in this thread (hooks of the main thread do not reach workers on Node 20), then loads the TypeScript worker.
import { register } from 'tsx/esm/api';

register();
await import('./result-worker.ts');
