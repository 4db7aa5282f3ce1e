export * from './test-app';
export * from './body';
