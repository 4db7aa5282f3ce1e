// What other features may use of this one besides its api/ hooks.
export { SavedSearchesPanel } from './components/saved-searches-panel';
