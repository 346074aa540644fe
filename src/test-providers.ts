import {
  provideZonelessChangeDetection,
  type Provider,
  type EnvironmentProviders,
} from '@angular/core';
import { MAT_ICON_DEFAULT_OPTIONS } from '@angular/material/icon';

const providers: (Provider | EnvironmentProviders)[] = [
  provideZonelessChangeDetection(),
  { provide: MAT_ICON_DEFAULT_OPTIONS, useValue: { fontSet: 'material-symbols-outlined' } },
];

export default providers;
