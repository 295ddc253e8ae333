// One import for the walk core: the answer log's schemas and the path logic over a guide version.
export * from './answers';
export * from './walk-path';
export * from './prefill';
