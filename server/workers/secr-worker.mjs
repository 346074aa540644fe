// Worker-thread entry for SECR fits. Worker threads start without the tsx loader when the parent
// was not started by tsx (vitest, plain node), so register it before loading the TypeScript task.
import { register } from 'tsx/esm/api';

register();
const task = await import('./secr-task.ts');

export default task.default;
