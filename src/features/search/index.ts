// What other features may use of this one besides its api/ hooks.
export { HighlightLegend, Mark } from './components/highlight';
export {
  MODE_LABELS,
  hasSearch,
  parseSearchState,
  searchHref,
  type SearchState,
} from './search-state';
