import { ChangeDetectionStrategy, Component, effect, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatOption, MatSelect } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { SENSITIVITY_CATEGORIES, type SensitivityCategory } from '../../../shared/projects';
import { apiErrorDetails, apiErrorMessage } from '../core/api-error';
import { ProjectStore } from '../core/project-store';
import { CautionNote } from '../ui/caution-note';
import { ProjectsApi } from './projects-api';

const SENSITIVITY_TEXT: Record<SensitivityCategory, string> = {
  none: 'Not sensitive — exact coordinates',
  low: 'Low — rounded to 0.001° (about 100 m)',
  medium: 'Medium — rounded to 0.01° (about 1 km)',
  high: 'High — rounded to 0.1° (about 10 km)',
  extreme: 'Extreme — coordinates withheld',
};

/** The ecologist's project settings: survey rules, review policy and location sensitivity. */
@Component({
  selector: 'mac-project-settings-page',
  imports: [
    ReactiveFormsModule,
    MatFormField,
    MatLabel,
    MatHint,
    MatError,
    MatInput,
    MatSelect,
    MatOption,
    MatButton,
    CautionNote,
  ],
  templateUrl: './project-settings-page.html',
  styles: `
    form {
      display: flex;
      flex-direction: column;
      gap: 16px;
      max-width: 880px;
    }
    .errors {
      color: var(--mat-sys-error);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ProjectSettingsPage {
  private readonly store = inject(ProjectStore);
  private readonly api = inject(ProjectsApi);
  private readonly snackBar = inject(MatSnackBar);
  protected readonly sensitivities = SENSITIVITY_CATEGORIES.map((value) => ({
    value,
    text: SENSITIVITY_TEXT[value],
  }));
  protected readonly busy = signal(false);
  protected readonly errors = signal<string[]>([]);
  protected readonly form = inject(NonNullableFormBuilder).group({
    name: ['', [Validators.required, Validators.minLength(3)]],
    description: [''],
    targetSpeciesScientific: ['', Validators.required],
    targetSpeciesCommon: ['', Validators.required],
    timezone: ['', Validators.required],
    independenceMinutes: [30, [Validators.required, Validators.min(1), Validators.max(1440)]],
    occasionHours: [24, [Validators.required, Validators.min(1)]],
    reviewersPerSighting: [2 as 1 | 2],
    sensitivity: ['medium' as SensitivityCategory],
    sensitivityReviewDate: [''],
    codePrefix: ['', [Validators.required, Validators.pattern(/^[A-Z]{1,6}$/)]],
  });

  constructor() {
    effect(() => {
      const p = this.store.current();
      if (!p) return;
      this.form.reset({ ...p, sensitivityReviewDate: p.sensitivityReviewDate ?? '' });
    });
  }

  protected async save(): Promise<void> {
    const p = this.store.current();
    if (!p || this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.errors.set([]);
    try {
      const value = this.form.getRawValue();
      const saved = await this.api.updateSettings(p.slug, {
        ...value,
        sensitivityReviewDate: value.sensitivityReviewDate || null,
      });
      this.store.current.set(saved);
      this.snackBar.open('Settings saved.', undefined, { duration: 3000 });
    } catch (err) {
      const details = apiErrorDetails(err);
      this.errors.set(details.length ? details : [apiErrorMessage(err)]);
    } finally {
      this.busy.set(false);
    }
  }
}
