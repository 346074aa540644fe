// Worker-thread entry: lets piscina run the TypeScript task under tsx in any host process
// (the tsx CLI, Vitest, or plain node).
import { register } from 'tsx/esm/api';

register();
const task = await import('./derivatives-task.ts');

export default task.default;
