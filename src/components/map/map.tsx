import { lazy, Suspense } from 'react';
import { ErrorBoundary } from '@/components/errors/error-boundary';
import { PanelError } from '@/components/errors/error-panel';
import { Spinner } from '@/components/ui/spinner';
import type { PlaceMapProps } from './types';

export type { LatLon, MapLine, MapMarker, MapMarkerKind, PlaceMapProps } from './types';

// Leaflet, its CSS and the US outlines load only when a page shows a map.
const LazyPlaceMap = lazy(() => import('./place-map'));

function MapLoading({ height }: { height: number }) {
  return (
    <div style={{ height }} className="flex items-center justify-center rounded-panel border border-ink-hairline bg-paper-sunken text-spruce-600">
      <Spinner label="Loading the map" />
    </div>
  );
}

/**
 * A map of shops and labs over the US outlines. It fails on its own: a broken map shows a
 * message and the page around it (with the same labs as a list) keeps working.
 */
export function PlaceMap(props: PlaceMapProps & { unavailableText?: string }) {
  const { unavailableText = 'The list beside it has the same labs.', ...mapProps } = props;
  const height = mapProps.height ?? 360;
  return (
    <ErrorBoundary
      fallback={({ reset }) => (
        <PanelError title="The map could not be shown" onRetry={reset}>
          {unavailableText}
        </PanelError>
      )}
    >
      <Suspense fallback={<MapLoading height={height} />}>
        <LazyPlaceMap {...mapProps} />
      </Suspense>
    </ErrorBoundary>
  );
}
