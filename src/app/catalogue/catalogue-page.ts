import { MatIcon } from '@angular/material/icon';
import { MatAnchor } from '@angular/material/button';
import { DatePipe } from '@angular/common';
import { httpResource } from '@angular/common/http';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  inject,
  signal,
  viewChild,
} from '@angular/core';
import { ScrollingModule } from '@angular/cdk/scrolling';
import { FormsModule } from '@angular/forms';
import { MatButtonToggle, MatButtonToggleGroup } from '@angular/material/button-toggle';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatPaginator } from '@angular/material/paginator';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatOption, MatSelect } from '@angular/material/select';
import { MatSort, MatSortHeader } from '@angular/material/sort';
import {
  MatCell,
  MatCellDef,
  MatColumnDef,
  MatHeaderCell,
  MatHeaderCellDef,
  MatHeaderRow,
  MatHeaderRowDef,
  MatRow,
  MatRowDef,
  MatTable,
  MatTableDataSource,
} from '@angular/material/table';
import { RouterLink } from '@angular/router';
import type { CatalogueEntry } from '../../../shared/identify';
import type { StationView } from '../../../shared/stations';
import { ProjectStore } from '../core/project-store';
import { EmptyState } from '../ui/empty-state';

/** The catalogue of individuals: search, filters, sortable table with paging, or one long virtual list. */
@Component({
  selector: 'mac-catalogue-page',
  imports: [
    MatAnchor,
    MatIcon,
    DatePipe,
    FormsModule,
    RouterLink,
    ScrollingModule,
    MatFormField,
    MatLabel,
    MatInput,
    MatSelect,
    MatOption,
    MatButtonToggleGroup,
    MatButtonToggle,
    MatTable,
    MatColumnDef,
    MatHeaderCell,
    MatHeaderCellDef,
    MatCell,
    MatCellDef,
    MatHeaderRow,
    MatHeaderRowDef,
    MatRow,
    MatRowDef,
    MatSort,
    MatSortHeader,
    MatPaginator,
    MatProgressBar,
    EmptyState,
  ],
  templateUrl: './catalogue-page.html',
  styleUrl: './catalogue-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CataloguePage {
  private readonly store = inject(ProjectStore);
  protected readonly slug = computed(() => this.store.current()?.slug ?? '');
  protected readonly query = signal('');
  protected readonly sex = signal('');
  protected readonly coverage = signal('');
  protected readonly stationId = signal('');
  protected readonly seenAfter = signal('');
  protected readonly view = signal<'table' | 'list'>('table');
  protected readonly columns = [
    'left',
    'right',
    'code',
    'nickname',
    'sex',
    'coverage',
    'sightings',
    'stations',
    'lastSeen',
  ];
  protected readonly stations = httpResource<StationView[]>(
    () => `/api/projects/${this.slug()}/stations`,
    { defaultValue: [] },
  );
  protected readonly entries = httpResource<CatalogueEntry[]>(
    () => {
      const params = new URLSearchParams();
      if (this.query().trim()) params.set('query', this.query().trim());
      if (this.sex()) params.set('sex', this.sex());
      if (this.coverage()) params.set('coverage', this.coverage());
      if (this.stationId()) params.set('stationId', this.stationId());
      if (this.seenAfter()) params.set('seenAfter', this.seenAfter());
      return `/api/projects/${this.slug()}/individuals?${params.toString()}`;
    },
    { defaultValue: [] },
  );
  protected readonly data = new MatTableDataSource<CatalogueEntry>([]);
  private readonly sort = viewChild(MatSort);
  private readonly paginator = viewChild(MatPaginator);

  constructor() {
    this.data.sortingDataAccessor = (e, column) => {
      switch (column) {
        case 'code':
          return e.code ?? '';
        case 'lastSeen':
          return e.lastSeen ?? '';
        case 'stations':
          return e.stations.length;
        case 'coverage':
          return Number(e.coverage.left) + Number(e.coverage.right);
        default:
          return String((e as unknown as Record<string, unknown>)[column] ?? '');
      }
    };
    effect(() => {
      this.data.data = this.entries.value();
      const sort = this.sort();
      const paginator = this.paginator();
      if (sort) this.data.sort = sort;
      if (paginator) this.data.paginator = paginator;
    });
  }

  protected reference(e: CatalogueEntry, flank: 'left' | 'right'): string | null {
    return e.references.find((r) => r.flank === flank)?.thumbUrl ?? null;
  }

  protected coverageText(e: CatalogueEntry): string {
    if (e.coverage.left && e.coverage.right) return 'both flanks';
    if (e.coverage.left) return 'left only';
    if (e.coverage.right) return 'right only';
    return 'no flank yet';
  }
}
