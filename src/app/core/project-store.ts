import { HttpClient } from '@angular/common/http';
import { Injectable, computed, inject, signal } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { ProjectDetail, ProjectListItem } from '../../../shared/projects';
import { roleAtLeast, type ProjectRole } from '../../../shared/roles';

/** The project being worked in, and the list of projects to switch between. */
@Injectable({ providedIn: 'root' })
export class ProjectStore {
  private readonly http = inject(HttpClient);
  readonly current = signal<ProjectDetail | null>(null);
  readonly list = signal<ProjectListItem[]>([]);
  readonly error = signal<string | null>(null);
  readonly slug = computed(() => this.current()?.slug ?? null);

  /** Loads a project's details (the server checks membership). */
  async open(slug: string): Promise<ProjectDetail> {
    if (this.current()?.slug !== slug) this.current.set(null);
    const detail = await firstValueFrom(this.http.get<ProjectDetail>(`/api/projects/${slug}`));
    this.current.set(detail);
    return detail;
  }

  /** Reloads the list of projects for the switcher. */
  async loadList(): Promise<ProjectListItem[]> {
    const list = await firstValueFrom(this.http.get<ProjectListItem[]>('/api/projects'));
    this.list.set(list);
    return list;
  }

  /** True when the user's role in the current project is at least `role`. */
  can(role: ProjectRole): boolean {
    return roleAtLeast(this.current()?.role ?? null, role);
  }
}
