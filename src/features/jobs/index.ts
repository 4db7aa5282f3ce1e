// What other features may use of this one besides its api/ hooks.
export { JobProgress } from './components/job-progress';
export { ProgressBar } from './components/progress-bar';
