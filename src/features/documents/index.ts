// What other features may use of this one besides its api/ hooks.
export { DOC_TYPE_LABELS, docTypeLabel, formatBytes } from './format';
