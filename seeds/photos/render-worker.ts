/** Worker-thread entry for renderSet: renders one spec per task. */
import { renderPhoto } from './index';
import type { PhotoSpec } from './types';

/** Piscina calls the default export with each task. */
export default async function renderTask(spec: PhotoSpec) {
  return renderPhoto(spec);
}
