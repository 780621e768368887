import 'leaflet/dist/leaflet.css';
import { useEffect, useMemo } from 'react';
import L, { type LatLngBoundsExpression, type LatLngExpression } from 'leaflet';
import { GeoJSON, MapContainer, Marker, Polyline, TileLayer, Tooltip, useMap } from 'react-leaflet';
import { feature } from 'topojson-client';
import type { GeometryCollection, Topology } from 'topojson-specification';
import statesTopology from 'us-atlas/states-10m.json';
import type { LatLon, MapMarker, MapMarkerKind, PlaceMapProps } from './types';

// The offline base map: US state outlines from us-atlas (US Census Bureau cartographic
// boundaries), drawn as vector shapes, so the map needs no tile server.

/** Set VITE_MAP_TILE_URL at build time where a deployment has a tile server. */
export const DEFAULT_TILE_URL: string | null = (import.meta.env.VITE_MAP_TILE_URL as string | undefined) || null;

const topology = statesTopology as unknown as Topology<{ states: GeometryCollection; nation: GeometryCollection }>;
const states = feature(topology, topology.objects.states);

/** The lower 48, where every lab and shop of the network is today. */
const CONTIGUOUS_US: LatLngBoundsExpression = [
  [24.4, -124.8],
  [49.4, -66.9],
];

const toLatLng = (p: LatLon): LatLngExpression => [p.lat, p.lon];

const markerLook: Record<MapMarkerKind, { className: string; size: number }> = {
  shop: { className: 'flex size-8 items-center justify-center rounded-md border-2 border-white bg-copper-600 text-white shadow-lift', size: 32 },
  candidate: { className: 'flex size-7 items-center justify-center rounded-full border-2 border-white bg-spruce-700 text-xs font-bold text-white shadow-lift', size: 28 },
  lab: { className: 'flex size-7 items-center justify-center rounded-full border-2 border-white bg-spruce-700 text-xs font-bold text-white shadow-lift', size: 28 },
  excluded: { className: 'flex size-5 items-center justify-center rounded-full border-2 border-white bg-ink-faint text-[10px] font-bold text-white opacity-80', size: 20 },
  'lab-muted': { className: 'flex size-5 items-center justify-center rounded-full border-2 border-white bg-ink-faint text-[10px] font-bold text-white opacity-80', size: 20 },
};

const shopGlyph =
  '<svg aria-hidden="true" viewBox="0 0 20 20" width="16" height="16" fill="currentColor"><path d="M3 8.5 10 3l7 5.5V17h-4.5v-5h-5v5H3z"/></svg>';

function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

function iconFor(marker: MapMarker): L.DivIcon {
  const look = markerLook[marker.kind];
  const inner = marker.kind === 'shop' ? shopGlyph : marker.badge ? escapeHtml(marker.badge) : '';
  return L.divIcon({
    className: 'pp-map-marker',
    html: `<span aria-hidden="true" class="${look.className}">${inner}</span>`,
    iconSize: [look.size, look.size],
    iconAnchor: [look.size / 2, look.size / 2],
    tooltipAnchor: [look.size / 2, 0],
  });
}

/** Fits the view to what is on the map whenever the set of places changes. */
function FitToPlaces({ places }: { places: LatLon[] }) {
  const map = useMap();
  const key = places.map((p) => `${p.lat},${p.lon}`).join(';');
  useEffect(() => {
    if (places.length === 0) {
      map.fitBounds(CONTIGUOUS_US);
    } else if (places.length === 1) {
      map.setView(toLatLng(places[0]), 6);
    } else {
      map.fitBounds(L.latLngBounds(places.map((p) => [p.lat, p.lon] as [number, number])), { padding: [36, 36], maxZoom: 7 });
    }
    // `key` stands for `places`, which is a new array on every render.
  }, [map, key]);
  return null;
}

function PlaceMarker({ marker }: { marker: MapMarker }) {
  const icon = useMemo(() => iconFor(marker), [marker]);
  const accessibleName = [marker.name, ...marker.details].join('. ');
  return (
    <Marker
      position={toLatLng(marker.position)}
      icon={icon}
      keyboard
      zIndexOffset={marker.kind === 'shop' ? 1000 : marker.kind === 'candidate' || marker.kind === 'lab' ? 500 : 0}
      eventHandlers={{
        add: (event) => {
          // Leaflet makes keyboard markers focusable buttons; give each one its words.
          const element = (event.target as L.Marker).getElement();
          element?.setAttribute('aria-label', accessibleName);
        },
      }}
    >
      <Tooltip direction="top" offset={[0, -8]} opacity={1}>
        <div className="max-w-64 font-sans text-sm whitespace-normal text-ink">
          <p className="font-semibold text-ink-strong">{marker.name}</p>
          {marker.details.map((line) => (
            <p key={line}>{line}</p>
          ))}
        </div>
      </Tooltip>
    </Marker>
  );
}

export default function PlaceMap({ label, markers, lines = [], height = 360, tileUrl = DEFAULT_TILE_URL, tileAttribution }: PlaceMapProps) {
  const places = markers.map((m) => m.position);
  return (
    <div role="region" aria-label={label} className="overflow-hidden rounded-panel border border-ink-hairline">
      <MapContainer
        bounds={CONTIGUOUS_US}
        style={{ height, background: '#dfe9ec' }}
        scrollWheelZoom={false}
        zoomSnap={0.25}
        attributionControl
        className="font-sans"
      >
        {tileUrl ? (
          <TileLayer url={tileUrl} attribution={tileAttribution} />
        ) : (
          <GeoJSON
            data={states}
            interactive={false}
            attribution="US outlines: US Census Bureau, via us-atlas"
            style={{ color: '#a9b6af', weight: 1, fillColor: '#f6f3ec', fillOpacity: 1 }}
          />
        )}
        {lines.map((line) => (
          <Polyline
            key={line.id}
            positions={[toLatLng(line.from), toLatLng(line.to)]}
            interactive={false}
            pathOptions={{ color: line.emphasis ? '#c06a2b' : '#236a53', weight: line.emphasis ? 3.5 : 2, opacity: line.emphasis ? 0.95 : 0.6, dashArray: line.emphasis ? undefined : '6 5' }}
          >
            <Tooltip permanent direction="center" className="pp-map-line-label" opacity={0.92}>
              <span className="font-sans text-xs font-semibold text-ink-strong">{line.label}</span>
            </Tooltip>
          </Polyline>
        ))}
        {markers.map((marker) => (
          <PlaceMarker key={marker.id} marker={marker} />
        ))}
        <FitToPlaces places={places} />
      </MapContainer>
    </div>
  );
}
