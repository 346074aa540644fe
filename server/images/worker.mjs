// Worker-thread entry: lets piscina run the TypeScript tasks under tsx in any host process
// (the tsx CLI, Vitest, or plain node). Tasks are chosen by name.
import { register } from 'tsx/esm/api';

register();
const tasks = await import('./derivatives-task.ts');

export const derivatives = tasks.default;
export const blur = tasks.makeBlurred;
export default tasks.default;
