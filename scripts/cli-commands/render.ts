// `npm run cli -- render ...`: registered by scripts/cli.ts from this folder.
export { renderCommand as command } from '../cli-render';
export const name = 'render';
