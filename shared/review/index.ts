/** Review logic shared by server and client: results summaries, revision diffs, @mentions, user names. Pure TypeScript. */
export * from './summary.ts';
export * from './diff.ts';
export * from './mentions.ts';
export * from './user-names.ts';
export * from './parameter-words.ts';
export * from './risk.ts';
export * from './case-diff.ts';
