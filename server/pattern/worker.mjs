// Worker-thread entry: lets piscina run the TypeScript tasks under tsx in any host process
// (the tsx CLI, Vitest, or plain node). Tasks are chosen by name.
import { register } from 'tsx/esm/api';

register();
const tasks = await import('./worker-task.ts');

export const extract = tasks.extract;
export const rank = tasks.rank;
export const heap = tasks.heap;
export const fault = tasks.fault;
export default tasks.extract;
