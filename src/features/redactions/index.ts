// What other features may use of this one besides its api/ hooks.
export { RedactionPanel } from './components/redaction-panel';
