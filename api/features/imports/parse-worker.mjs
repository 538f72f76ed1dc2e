// Entry of the spreadsheet-reading worker threads (see parse-pool.ts). Plain JavaScript so
// that it starts the same under tsx, vitest and node; it loads the TypeScript reader through tsx.
import { tsImport } from 'tsx/esm/api';

const { readInWorker, previewInWorker, checkInWorker } = await tsImport('./parse-task.ts', import.meta.url);

export default readInWorker;
export const preview = previewInWorker;
export const check = checkInWorker;
