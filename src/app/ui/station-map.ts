import {
  ChangeDetectionStrategy,
  Component,
  ElementRef,
  afterNextRender,
  effect,
  input,
  output,
  viewChild,
  type OnDestroy,
} from '@angular/core';
import * as L from 'leaflet';
import type { Boundary } from '../../../shared/projects';

/** A point to draw on the map. */
export interface MapPoint {
  id: string;
  label: string;
  lat: number;
  lon: number;
  /** Relative size 0–1 (e.g. detections), optional. */
  weight?: number;
  highlight?: boolean;
}

/**
 * Stations on a plain background (works offline); map tiles only when the project sets a tile URL.
 * Points are drawn as they arrive, already generalised by the server where the role requires it.
 */
@Component({
  selector: 'mac-station-map',
  template: `<div #host class="map" role="img" [attr.aria-label]="ariaLabel()"></div>`,
  styles: `
    :host {
      display: block;
    }
    .map {
      height: var(--map-height, 360px);
      border-radius: 12px;
      border: 1px solid var(--mat-sys-outline-variant);
      background: #e8ece9;
      z-index: 0;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StationMap implements OnDestroy {
  readonly points = input<MapPoint[]>([]);
  readonly boundary = input<Boundary | null>(null);
  readonly tileUrl = input<string | null>(null);
  readonly ariaLabel = input('Map of camera stations');
  readonly pointSelected = output<string>();
  private readonly host = viewChild.required<ElementRef<HTMLDivElement>>('host');
  private map: L.Map | null = null;
  private layer: L.LayerGroup | null = null;
  private tiles: L.TileLayer | null = null;

  constructor() {
    afterNextRender(() => {
      this.map = L.map(this.host().nativeElement, { attributionControl: false, zoomSnap: 0.25 });
      L.control.scale({ imperial: false }).addTo(this.map);
      this.layer = L.layerGroup().addTo(this.map);
      this.draw();
    });
    effect(() => {
      this.points();
      this.boundary();
      this.tileUrl();
      this.draw();
    });
  }

  ngOnDestroy(): void {
    this.map?.remove();
  }

  private draw(): void {
    const map = this.map;
    const layer = this.layer;
    if (!map || !layer) return;
    layer.clearLayers();
    const url = this.tileUrl();
    if (url && !this.tiles) this.tiles = L.tileLayer(url, { maxZoom: 18 }).addTo(map);
    if (!url && this.tiles) {
      this.tiles.remove();
      this.tiles = null;
    }
    const bounds = L.latLngBounds([]);
    const boundary = this.boundary();
    if (boundary) {
      const geo = L.geoJSON(boundary as GeoJSON.GeoJsonObject, {
        style: { color: '#036879', weight: 2, fillColor: '#8cd1e3', fillOpacity: 0.15 },
      }).addTo(layer);
      bounds.extend(geo.getBounds());
    }
    for (const p of this.points()) {
      const marker = L.circleMarker([p.lat, p.lon], {
        radius: 5 + 7 * (p.weight ?? 0),
        color: p.highlight ? '#83541b' : '#024e5b',
        weight: 2,
        fillColor: p.highlight ? '#eebd8e' : '#55b8cf',
        fillOpacity: 0.85,
      })
        .bindTooltip(p.label, { direction: 'top' })
        .on('click', () => this.pointSelected.emit(p.id));
      marker.addTo(layer);
      bounds.extend([p.lat, p.lon]);
    }
    if (bounds.isValid()) map.fitBounds(bounds.pad(0.15), { maxZoom: 15 });
    else map.setView([0, 0], 2);
  }
}
