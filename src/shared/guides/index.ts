// One import for the guide core: schemas, validation, bands, branches and the guide file.
// The demo guide stays in sample.ts so it is only bundled where it is imported.
export * from './schema';
export * from './graph';
export * from './validate';
export * from './export';
