/** Review logic shared by server and client: results summaries, revision diffs, @mentions. Pure TypeScript. */
export * from './summary.ts';
export * from './diff.ts';
export * from './mentions.ts';
