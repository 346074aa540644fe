import { DOCUMENT } from '@angular/common';
import { ChangeDetectionStrategy, Component, effect, inject, signal } from '@angular/core';
import { MatIconButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatTooltip } from '@angular/material/tooltip';

const KEY = 'maculo.theme';

/** Light or dark surfaces; the choice is remembered in this browser. */
@Component({
  selector: 'mac-theme-toggle',
  imports: [MatIconButton, MatIcon, MatTooltip],
  template: `
    <button
      mat-icon-button
      (click)="toggle()"
      [matTooltip]="dark() ? 'Use light surfaces' : 'Use dark surfaces'"
      [attr.aria-label]="dark() ? 'Use light surfaces' : 'Use dark surfaces'"
    >
      <mat-icon>{{ dark() ? 'light_mode' : 'dark_mode' }}</mat-icon>
    </button>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ThemeToggle {
  private readonly document = inject(DOCUMENT);
  protected readonly dark = signal(this.stored() === 'dark');

  constructor() {
    effect(() => {
      const dark = this.dark();
      this.document.documentElement.classList.toggle('dark-theme', dark);
      try {
        localStorage.setItem(KEY, dark ? 'dark' : 'light');
      } catch {
        // storage may be unavailable (private mode); the toggle still works for this page
      }
    });
  }

  protected toggle(): void {
    this.dark.update((d) => !d);
  }

  private stored(): string | null {
    try {
      return localStorage.getItem(KEY);
    } catch {
      return null;
    }
  }
}
