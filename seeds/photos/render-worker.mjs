// Worker threads do not inherit a TypeScript loader when started from a test runner, so the
// worker registers tsx itself before loading the TypeScript entry.
import { register } from 'tsx/esm/api';

register();
const mod = await import('./render-worker.ts');

export default mod.default;
