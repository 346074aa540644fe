import { DatePipe } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  input,
  output,
  signal,
} from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import type { PhotoView } from '../../../shared/ingest';
import type { DeploymentView } from '../../../shared/stations';
import { wallToUtcMs } from '../../../shared/zoned-time';
import { apiErrorMessage } from '../core/api-error';
import { StationsApi } from './stations-api';

function describeOffset(seconds: number): string {
  const sign = seconds < 0 ? '−' : '+';
  let rest = Math.abs(seconds);
  const days = Math.floor(rest / 86400);
  rest -= days * 86400;
  const h = Math.floor(rest / 3600);
  const m = Math.floor((rest % 3600) / 60);
  const s = rest % 60;
  return `${sign}${days ? `${days} d ` : ''}${h} h ${m} min ${s} s`;
}

/**
 * Clock fix: open the setup-sheet or reference-clock photo, type the true time it shows, and the
 * offset (true − camera time) applies to every photo of the deployment.
 */
@Component({
  selector: 'mac-clock-fix-panel',
  imports: [DatePipe, FormsModule, MatFormField, MatLabel, MatHint, MatInput, MatButton],
  templateUrl: './clock-fix-panel.html',
  styleUrl: './clock-fix-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ClockFixPanel {
  private readonly api = inject(StationsApi);
  readonly slug = input.required<string>();
  readonly deployment = input.required<DeploymentView>();
  readonly photos = input<PhotoView[]>([]);
  readonly fixed = output<DeploymentView>();
  protected readonly selected = signal<PhotoView | null>(null);
  protected readonly trueTime = signal('');
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly withTime = computed(() => this.photos().filter((p) => p.takenAtExif));
  protected readonly preview = computed(() => {
    const photo = this.selected();
    const typed = this.trueTime();
    if (!photo?.takenAtExif || !typed) return null;
    const zone = this.deployment().timezone;
    const exif = wallToUtcMs(photo.takenAtExif, zone);
    const truth = wallToUtcMs(typed, zone);
    if (exif === null || truth === null) return null;
    return describeOffset(Math.round((truth - exif) / 1000));
  });
  protected readonly current = computed(() => describeOffset(this.deployment().clockOffsetSeconds));

  protected pick(photo: PhotoView): void {
    this.selected.set(photo);
    this.trueTime.set(photo.takenAtExif!.slice(0, 19));
  }

  protected async apply(): Promise<void> {
    const photo = this.selected();
    if (!photo) return;
    this.busy.set(true);
    this.error.set(null);
    try {
      const typed = this.trueTime().length === 16 ? `${this.trueTime()}:00` : this.trueTime();
      this.fixed.emit(await this.api.clockFix(this.slug(), this.deployment().id, photo.id, typed));
    } catch (err) {
      this.error.set(apiErrorMessage(err));
    } finally {
      this.busy.set(false);
    }
  }
}
