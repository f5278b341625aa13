/**
 * The words a reader sees, in one pure home: reason sentences and cautions made from the
 * engine's structured output, labels of states and actions, number formats. Imported by the
 * audit JSON assembly (src/lib/audit), the pages, the islands and (later) the workspace and memo.
 * docs/decisions/006-settings-table-and-words.md.
 */
export * from './cautions';
export * from './formats';
export * from './labels';
export * from './outcome';
export * from './reasons';
export * from './handoff';
