export * from './test-app';
