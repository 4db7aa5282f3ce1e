// What other features may use of this one besides its api/ hooks.
export { BulkCodingBar } from './components/bulk-coding-bar';
