import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { SessionInputs } from '../../../shared/analyses';
import { StationMap, type MapPoint } from '../ui/station-map';

/** Stations as map points sized by detections; stations with detections are highlighted. */
export function detectionPoints(inputs: SessionInputs): MapPoint[] {
  const detections = inputs.stations.map(() => 0);
  const animals = inputs.stations.map(() => new Set<number>());
  for (const [i, , k, n] of inputs.detections) {
    detections[k] = (detections[k] ?? 0) + n;
    animals[k]?.add(i);
  }
  const most = Math.max(1, ...detections);
  return inputs.stations.map((s, k) => {
    const n = detections[k] ?? 0;
    const m = animals[k]?.size ?? 0;
    return {
      id: s.id,
      label: `${s.code}: ${n} detection${n === 1 ? '' : 's'} of ${m} individual${m === 1 ? '' : 's'}`,
      lat: s.lat,
      lon: s.lon,
      weight: n / most,
      highlight: n > 0,
    };
  });
}

/** The session's stations on a map, sized by how many detections each had. */
@Component({
  selector: 'mac-detection-map',
  imports: [StationMap],
  template: `
    <mac-station-map
      [points]="points()"
      [ariaLabel]="'Map of ' + points().length + ' stations; larger marks had more detections'"
    />
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DetectionMap {
  readonly inputs = input.required<SessionInputs>();
  protected readonly points = computed(() => detectionPoints(this.inputs()));
}
