/** The analyst's review: its data, the edits, and the review file. */
export * from './types';
export * from './edits';
export * from './format';
export * from './export';
export * from './candidates';
