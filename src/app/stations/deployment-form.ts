import {
  ChangeDetectionStrategy,
  Component,
  effect,
  inject,
  input,
  output,
  signal,
} from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatCheckbox } from '@angular/material/checkbox';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatOption, MatSelect } from '@angular/material/select';
import {
  FEATURE_TYPES,
  SENSITIVE_FEATURES,
  type DeploymentView,
  type FeatureType,
} from '../../../shared/stations';
import { isoUtc, utcToWall, wallToUtcMs } from '../../../shared/zoned-time';

/** What the form produces: times already converted from the camera's zone to UTC. */
export interface DeploymentFormValue {
  cameraLabel: string;
  cameraSerial: string | null;
  start: string;
  end: string;
  lastWorking: string | null;
  timezone: string;
  featureType: FeatureType | null;
  baitUse: boolean;
  notes: string;
}

const FEATURE_LABEL: Record<FeatureType, string> = {
  roadPaved: 'Paved road',
  roadDirt: 'Dirt road',
  trailHiking: 'Hiking trail',
  trailGame: 'Game trail',
  roadUnderpass: 'Road underpass',
  roadOverpass: 'Road overpass',
  roadBridge: 'Road bridge',
  culvert: 'Culvert',
  burrow: 'Burrow or den (sensitive)',
  nestSite: 'Nest site (sensitive)',
  carcass: 'Carcass (sensitive)',
  waterSource: 'Water source (sensitive)',
  fruitingTree: 'Fruiting tree',
};

/** Records or edits a deployment; times are typed in the camera clock's own zone. */
@Component({
  selector: 'mac-deployment-form',
  imports: [
    ReactiveFormsModule,
    MatFormField,
    MatLabel,
    MatHint,
    MatError,
    MatInput,
    MatSelect,
    MatOption,
    MatCheckbox,
    MatButton,
  ],
  templateUrl: './deployment-form.html',
  styles: `
    form {
      display: flex;
      flex-direction: column;
      gap: 12px;
    }
    .warn {
      color: var(--mat-sys-tertiary);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DeploymentForm {
  readonly initial = input<DeploymentView | null>(null);
  readonly defaultZone = input('UTC');
  readonly busy = input(false);
  readonly submitLabel = input('Save deployment');
  readonly saved = output<DeploymentFormValue>();
  protected readonly features = FEATURE_TYPES.map((value) => ({
    value,
    label: FEATURE_LABEL[value],
  }));
  protected readonly problem = signal<string | null>(null);
  protected readonly form = inject(NonNullableFormBuilder).group({
    cameraLabel: ['', Validators.required],
    cameraSerial: [''],
    start: ['', Validators.required],
    end: ['', Validators.required],
    lastWorking: [''],
    timezone: ['', Validators.required],
    featureType: ['' as FeatureType | ''],
    baitUse: [false],
    notes: [''],
  });

  constructor() {
    effect(() => {
      const d = this.initial();
      const zone = d?.timezone ?? this.defaultZone();
      this.form.reset({
        cameraLabel: d?.cameraLabel ?? '',
        cameraSerial: d?.cameraSerial ?? '',
        start: d ? utcToWall(d.start, zone) : '',
        end: d ? utcToWall(d.end, zone) : '',
        lastWorking: d?.lastWorking ? utcToWall(d.lastWorking, zone) : '',
        timezone: zone,
        featureType: d?.featureType ?? '',
        baitUse: d?.baitUse ?? false,
        notes: d?.notes ?? '',
      });
    });
  }

  protected isSensitive(feature: string): boolean {
    return (SENSITIVE_FEATURES as readonly string[]).includes(feature);
  }

  protected save(): void {
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const v = this.form.getRawValue();
    const toUtc = (wall: string) => {
      const ms = wallToUtcMs(wall, v.timezone);
      return ms === null ? null : isoUtc(ms);
    };
    const start = toUtc(v.start);
    const end = toUtc(v.end);
    const lastWorking = v.lastWorking ? toUtc(v.lastWorking) : null;
    if (!start || !end) {
      this.problem.set('Check the start and end times.');
      return;
    }
    this.problem.set(null);
    this.saved.emit({
      cameraLabel: v.cameraLabel.trim(),
      cameraSerial: v.cameraSerial.trim() || null,
      start,
      end,
      lastWorking,
      timezone: v.timezone.trim(),
      featureType: v.featureType || null,
      baitUse: v.baitUse,
      notes: v.notes,
    });
  }
}
