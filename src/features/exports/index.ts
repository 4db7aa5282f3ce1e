// What other features may use of this one besides its api/ hooks.
export { ExportButtons } from './components/export-buttons';
