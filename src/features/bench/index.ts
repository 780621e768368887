// What other features may use from the bench: the imaging bar and the recovered-file summary.
export { ImagingProgress } from './components/imaging-progress';
export { ManifestSummary } from './components/manifest-summary';
