// Props of the map, kept free of Leaflet so that pages can describe a map without
// pulling Leaflet into the main bundle (the map itself loads on demand).

export interface LatLon {
  lat: number;
  lon: number;
}

export type MapMarkerKind = 'shop' | 'candidate' | 'excluded' | 'lab' | 'lab-muted';

export interface MapMarker {
  id: string;
  position: LatLon;
  kind: MapMarkerKind;
  name: string;
  /** A short text drawn on the marker, such as the lab's rank ("1"). */
  badge?: string;
  /** Lines shown in the marker's tooltip on hover and on keyboard focus, and read with its name. */
  details: string[];
}

export interface MapLine {
  id: string;
  from: LatLon;
  to: LatLon;
  /** Drawn along the line, e.g. "646 mi · 6 days". */
  label: string;
  /** The line to the lab the case is offered to. */
  emphasis?: boolean;
}

export interface PlaceMapProps {
  /** Names the map region for assistive technology. */
  label: string;
  markers: readonly MapMarker[];
  lines?: readonly MapLine[];
  /** Height in pixels. */
  height?: number;
  /**
   * A raster tile URL template ("https://tiles.example/{z}/{x}/{y}.png") for deployments that
   * have a tile server; the content security policy's img-src must then allow its origin.
   * Without one the map draws the US outlines shipped with the app.
   */
  tileUrl?: string | null;
  tileAttribution?: string;
}
